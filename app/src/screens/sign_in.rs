//! The desk's sign-in, shared by every screen that needs one (review, urgent animals,
//! samples, people): username and password, and the server's words when it refuses.

use leptos::prelude::*;
use shared_types::Role;

use crate::data::api;
use crate::data::words::t;

#[component]
pub fn SignIn(role: RwSignal<Option<Role>>) -> impl IntoView {
    let username = RwSignal::new(String::new());
    let password = RwSignal::new(String::new());
    let problem = RwSignal::new(String::new());
    let submit = move |ev: leptos::ev::SubmitEvent| {
        ev.prevent_default();
        let (name, secret) = (username.get_untracked(), password.get_untracked());
        leptos::task::spawn_local(async move {
            match api::sign_in(name, secret).await {
                Ok(info) => {
                    password.set(String::new());
                    role.set(Some(info.role));
                }
                Err(err) => problem.set(err.to_string()),
            }
        });
    };
    view! {
        <section class="card review">
            <h2>{t("sign-in-heading")}</h2>
            <form id="sign-in" on:submit=submit>
                <label>{t("sign-in-username")}" "<input id="username" autocomplete="username" prop:value=move || username.get() on:input=move |ev| username.set(event_target_value(&ev)) /></label>
                <label>{t("sign-in-password")}" "<input id="password" type="password" autocomplete="current-password" prop:value=move || password.get() on:input=move |ev| password.set(event_target_value(&ev)) /></label>
                <button type="submit" class="primary">{t("sign-in-button")}</button>
                <p class="problems" role="alert">{move || problem.get()}</p>
            </form>
        </section>
    }
}
