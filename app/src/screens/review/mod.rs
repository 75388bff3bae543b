//! The reviewers' screens (`#review`): sign in, then the queue ([`queue`]) and one
//! record at a time with everything needed to decide ([`record`]: photos that open
//! large and zoom ([`zoom`]), times and places, the guided key's answers, possible
//! duplicates ([`duplicates`]), history, and the actions). Needs a connection: review
//! happens at a desk, and the server decides.

mod duplicates;
mod queue;
mod record;
mod zoom;

use leptos::prelude::*;
use shared_types::Role;

use crate::data::api;
use crate::screens::review::queue::Queue;

#[component]
pub fn ReviewScreen() -> impl IntoView {
    let role = RwSignal::new(None::<Role>);
    let checked = RwSignal::new(false);
    leptos::task::spawn_local(async move {
        role.set(api::session().await.ok().and_then(|s| s.staff_role()));
        checked.set(true);
    });
    view! {
        <section class="card review">
            <h2>"Review"</h2>
            <p class="hint">"Decisions are kept with who made them and when."</p>
            {move || match (checked.get(), role.get()) {
                (false, _) => view! { <p class="hint">"checking your sign-in…"</p> }.into_any(),
                (true, None) => view! { <SignIn role=role /> }.into_any(),
                (true, Some(r)) => view! { <Queue role=r signed_out=move || role.set(None) /> }.into_any(),
            }}
        </section>
    }
}

#[component]
fn SignIn(role: RwSignal<Option<Role>>) -> impl IntoView {
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
        <form id="sign-in" on:submit=submit>
            <label>"Username" <input id="username" autocomplete="username" prop:value=move || username.get() on:input=move |ev| username.set(event_target_value(&ev)) /></label>
            <label>"Password" <input id="password" type="password" autocomplete="current-password" prop:value=move || password.get() on:input=move |ev| password.set(event_target_value(&ev)) /></label>
            <button type="submit" class="primary">"Sign in"</button>
            <p class="problems" role="alert">{move || problem.get()}</p>
        </form>
    }
}
