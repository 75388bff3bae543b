//! The desk's page (the bundle served at `/desk/`, never downloaded by a walker's phone):
//! the header, one sign-in for every screen that needs it, and the screen the address's
//! `#…` part names — the review queue and record, live animals (`#urgent`), the sample
//! lookup (`#samples`), people, figures and downloads, safety. Responders land on the
//! live animals; the recording screens are the phone's page, a plain link away. Needs a
//! connection: the server decides everything here.

use leptos::prelude::*;
use shared_types::Role;

use crate::data::words::t;
use crate::data::{api, page, site};
use crate::screens::fieldwork::lookup::SampleLookupScreen;
use crate::screens::fieldwork::urgent::UrgentScreen;
use crate::screens::figures::FiguresScreen;
use crate::screens::language::LanguageSwitch;
use crate::screens::people::PeopleScreen;
use crate::screens::review::ReviewScreen;
use crate::screens::safety::SafetyText;
use crate::screens::sign_in::SignIn;

/// Which screen a signed-in person sees for the address's `#…` part: responders have
/// the live animals only; the people screen is for admins.
fn staff_screen(hash: &str, role: Role) -> &'static str {
    match (hash, role) {
        (_, Role::Responder) | ("#urgent", _) => "#urgent",
        ("#samples", _) => "#samples",
        ("#people", Role::Admin) => "#people",
        _ => "#review",
    }
}

#[component]
pub fn App() -> impl IntoView {
    let screen = RwSignal::new(page::current_hash());
    page::on_hash_change(move || screen.set(page::current_hash()));
    let role = RwSignal::new(None::<Role>);
    let checked = RwSignal::new(false);
    leptos::task::spawn_local(async move {
        role.set(api::session().await.ok().and_then(|s| s.staff_role()));
        checked.set(true);
    });
    let site_info = RwSignal::new(site::cached());
    site::refresh(site_info);
    let responders = Signal::derive(move || site_info.with(|s| s.responders_phone.clone()));
    let signed_out = move || role.set(None);
    let is = move |wanted: Role| role.get() == Some(wanted);
    let reviews = move || matches!(role.get(), Some(Role::Reviewer | Role::Admin));
    let staff_view = move || match (checked.get(), role.get()) {
        (false, _) => view! { <p class="hint">{t("desk-checking")}</p> }.into_any(),
        (true, None) => view! { <SignIn role=role /> }.into_any(),
        (true, Some(r)) => match staff_screen(&screen.get(), r) {
            "#urgent" => view! { <UrgentScreen role=r /> }.into_any(),
            "#samples" => view! { <SampleLookupScreen /> }.into_any(),
            "#people" => view! { <PeopleScreen /> }.into_any(),
            _ => view! { <ReviewScreen role=r signed_out=signed_out /> }.into_any(),
        },
    };
    view! {
        <header class="top">
            <h1><a href="#">{t("desk-title")}</a></h1>
            <nav class="top-links">
                <a id="urgent-link" class="pill review-link" href="#urgent">{t("desk-urgent")}</a>
                <Show when=reviews>
                    <a class="pill review-link" href="#review">{t("phone-review-link")}</a>
                    <a id="samples-link" class="pill review-link" href="#samples">{t("desk-samples")}</a>
                </Show>
                <a class="pill review-link" href="#figures">{t("phone-figures-link")}</a>
                <Show when=move || is(Role::Admin)>
                    <a class="pill review-link" href="#people">{t("desk-people")}</a>
                </Show>
                <a id="safety-link" class="pill review-link" href="#safety">{t("phone-safety-link")}</a>
                <LanguageSwitch />
                <a id="phone-link" class="pill review-link" href="/">{t("desk-record")}</a>
            </nav>
        </header>
        <main>
            {move || match screen.get().as_str() {
                "#figures" => view! { <FiguresScreen /> }.into_any(),
                "#safety" => view! {
                    <section id="safety" class="card safety-card">
                        <h2>{t("phone-safety-heading")}</h2>
                        <SafetyText responders=responders />
                    </section>
                }.into_any(),
                _ => staff_view().into_any(),
            }}
        </main>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn responders_see_the_live_animals_and_only_admins_the_people() {
        assert_eq!(staff_screen("#review", Role::Responder), "#urgent");
        assert_eq!(staff_screen("#samples", Role::Responder), "#urgent");
        assert_eq!(staff_screen("", Role::Reviewer), "#review");
        assert_eq!(staff_screen("#samples", Role::Reviewer), "#samples");
        assert_eq!(staff_screen("#urgent", Role::Reviewer), "#urgent");
        assert_eq!(staff_screen("#people", Role::Reviewer), "#review");
        assert_eq!(staff_screen("#people", Role::Admin), "#people");
    }
}
