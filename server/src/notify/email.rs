//! The email: the alert as plain text through the operator's SMTP server
//! (`--smtp-server`), to each of `--responders-email`. The server accepting the message
//! is the acknowledgement; a refusal or no connection is tried again.

use lettre::message::Mailbox;
use lettre::message::header::ContentType;
use lettre::transport::smtp::authentication::Credentials;
use lettre::{AsyncSmtpTransport, AsyncTransport as _, Message, Tokio1Executor};

use super::message::Alert;
use crate::settings::{Responders, SmtpSecurity};

/// Builds the transport the settings describe; `Err` names what is wrong with them.
pub fn transport(settings: &Responders) -> Result<AsyncSmtpTransport<Tokio1Executor>, String> {
    let server = settings.smtp_server.as_deref().ok_or("no --smtp-server is set")?;
    let (host, port) = server.rsplit_once(':').ok_or_else(|| format!("--smtp-server `{server}` is not HOST:PORT"))?;
    let port: u16 = port.parse().map_err(|_| format!("--smtp-server `{server}`: `{port}` is not a port number"))?;
    let builder = match settings.smtp_security {
        SmtpSecurity::None => AsyncSmtpTransport::<Tokio1Executor>::builder_dangerous(host),
        SmtpSecurity::Starttls => AsyncSmtpTransport::<Tokio1Executor>::starttls_relay(host)
            .map_err(|err| format!("setting up STARTTLS to {host}: {err}"))?,
        SmtpSecurity::Tls => AsyncSmtpTransport::<Tokio1Executor>::relay(host)
            .map_err(|err| format!("setting up TLS to {host}: {err}"))?,
    };
    let mut builder = builder.port(port).timeout(Some(super::webhook::TIMEOUT));
    if let (Some(user), Some(password)) = (&settings.smtp_username, &settings.smtp_password) {
        builder = builder.credentials(Credentials::new(user.clone(), password.clone()));
    }
    Ok(builder.build())
}

/// The message for `alert`, from the configured sender to every responder.
pub fn message(settings: &Responders, alert: &Alert) -> Result<Message, String> {
    let host = settings.smtp_server.as_deref().and_then(|s| s.rsplit_once(':')).map_or("localhost", |(h, _)| h);
    let from = settings.smtp_from.clone().unwrap_or_else(|| format!("wrackline <wrackline@{host}>"));
    let from: Mailbox = from.parse().map_err(|err| format!("--smtp-from `{from}`: {err}"))?;
    let mut builder = Message::builder().from(from).subject(alert.subject()).header(ContentType::TEXT_PLAIN);
    for to in &settings.email_to {
        let mailbox: Mailbox = to.trim().parse().map_err(|err| format!("--responders-email `{to}`: {err}"))?;
        builder = builder.to(mailbox);
    }
    builder.body(alert.text()).map_err(|err| format!("building the email: {err}"))
}

/// Sends one alert; `Err` says why it was not accepted.
pub async fn send(
    transport: &AsyncSmtpTransport<Tokio1Executor>,
    settings: &Responders,
    alert: &Alert,
) -> Result<(), String> {
    let message = message(settings, alert)?;
    transport.send(message).await.map(|_| ()).map_err(|err| format!("the SMTP server did not take the email: {err}"))
}
