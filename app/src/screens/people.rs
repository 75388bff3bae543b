//! `#people`: the admin's screen to add reviewers and admins, change their role, set a
//! new password, turn sign-ins off and on, and read the trail of those changes.

use leptos::prelude::*;
use shared_types::{PersonEvent, Role};

use crate::data::api::{self, StaffPerson};

/// One person on the people screen: role, a new password, on or off.
#[component]
fn PersonRow(
    person: StaffPerson,
    reload: impl Fn() + Copy + Send + Sync + 'static,
    problem: RwSignal<String>,
    note: RwSignal<String>,
) -> impl IntoView {
    let name = person.username.clone().unwrap_or_default();
    let new_password = RwSignal::new(String::new());
    // Each change: send it, then say what was done and show the list as it is now.
    let changed = move |outcome: Result<(), api::ApiError>, done: String| match outcome {
        Ok(()) => {
            problem.set(String::new());
            note.set(done);
            reload();
        }
        Err(err) => problem.set(err.to_string()),
    };
    let (role_name, password_name, toggle_name) = (name.clone(), name.clone(), name.clone());
    let change_role = move |ev: leptos::ev::Event| {
        let (who, role) = (role_name.clone(), event_target_value(&ev));
        leptos::task::spawn_local(async move {
            let outcome = api::set_role(&who, role.clone()).await;
            changed(outcome, format!("{who} is now {role}."));
        });
    };
    let reset = move |_| {
        let (who, password) = (password_name.clone(), new_password.get_untracked());
        new_password.set(String::new());
        leptos::task::spawn_local(async move {
            let outcome = api::set_password(&who, password).await;
            changed(outcome, format!("{who} has a new password; their sign-ins ended."));
        });
    };
    let turn_to = !person.disabled;
    let toggle = move |_| {
        let who = toggle_name.clone();
        let words = if turn_to { "turned off" } else { "turned on" };
        leptos::task::spawn_local(async move {
            let outcome = api::set_disabled(&who, turn_to).await;
            changed(outcome, format!("{who}'s sign-in is {words}."));
        });
    };
    view! {
        <li class="person" data-username=name.clone()>
            <span class="who">{format!("{name} · {} · {}{}", person.role.code(), person.display_name.clone().unwrap_or_default(), if person.disabled { " · turned off" } else { "" })}</span>
            <label>"Role" <select class="person-role" on:change=change_role>
                <option value="reviewer" selected=person.role == Role::Reviewer>"reviewer"</option>
                <option value="admin" selected=person.role == Role::Admin>"admin"</option>
            </select></label>
            <label>"New password" <input class="person-password" type="password" autocomplete="new-password" prop:value=move || new_password.get() on:input=move |ev| new_password.set(event_target_value(&ev)) /></label>
            <button type="button" class="small person-reset" on:click=reset>"Set password"</button>
            <button type="button" class="small person-toggle" on:click=toggle>{if person.disabled { "Turn on" } else { "Turn off" }}</button>
        </li>
    }
}

/// `#people`: the admin's screen to add reviewers and admins, change their role, set a
/// new password, turn sign-ins off and on, and read the trail of those changes.
#[component]
pub fn PeopleScreen() -> impl IntoView {
    let people = RwSignal::new(Vec::<StaffPerson>::new());
    let events = RwSignal::new(Vec::<PersonEvent>::new());
    let problem = RwSignal::new(String::new());
    let note = RwSignal::new(String::new());
    let add_note = RwSignal::new(String::new());
    let add_problem = RwSignal::new(String::new());
    let form = RwSignal::new((String::new(), String::new(), String::new(), "reviewer".to_owned()));
    let reload = move || {
        leptos::task::spawn_local(async move {
            match api::people().await {
                Ok(list) => people.set(list),
                Err(err) => problem.set(format!("{err} (sign in as an admin under Review first)")),
            }
            if let Ok(list) = api::people_events().await {
                events.set(list);
            }
        });
    };
    reload();
    let add = move |_| {
        let (username, display_name, password, role) = form.get_untracked();
        let added =
            format!("{username} was added as {role}. Give them their password in person; they sign in under Review.");
        leptos::task::spawn_local(async move {
            match api::add_person(username, display_name, password, role).await {
                Ok(()) => {
                    form.set((String::new(), String::new(), String::new(), "reviewer".into()));
                    add_problem.set(String::new());
                    note.set(added.clone());
                    add_note.set(added);
                    reload();
                }
                Err(err) => add_problem.set(err.to_string()),
            }
        });
    };
    view! {
        <section class="card people">
            <h2>"People"</h2>
            <p class="hint">"Observers need no sign-in: their phone gets its own identity. Contacts never leave the server."</p>
            <p class="problems" role="alert">{move || problem.get()}</p>
            <p id="people-note" class="hint">{move || note.get()}</p>
            <ul id="people-list">
                {move || people.get().into_iter().map(|p| view! { <PersonRow person=p reload=reload problem=problem note=note /> }).collect_view()}
            </ul>
            <fieldset>
                <legend>"Add a person"</legend>
                <div class="row">
                    <label>"Username" <input id="new-username" prop:value=move || form.with(|f| f.0.clone()) on:input=move |ev| form.update(|f| f.0 = event_target_value(&ev)) /></label>
                    <label>"Name shown" <input id="new-display-name" prop:value=move || form.with(|f| f.1.clone()) on:input=move |ev| form.update(|f| f.1 = event_target_value(&ev)) /></label>
                </div>
                <div class="row">
                    <label>"Password (10+ characters)" <input id="new-password" type="password" autocomplete="new-password" prop:value=move || form.with(|f| f.2.clone()) on:input=move |ev| form.update(|f| f.2 = event_target_value(&ev)) /></label>
                    <label>"Role" <select id="new-role" on:change=move |ev| form.update(|f| f.3 = event_target_value(&ev))>
                        <option value="reviewer">"reviewer"</option>
                        <option value="admin">"admin"</option>
                    </select></label>
                </div>
                <button id="add-person" type="button" class="primary" on:click=add>"Add"</button>
                <p id="add-problem" class="problems" role="alert">{move || add_problem.get()}</p>
                <p id="add-note" class="hint" role="status">{move || add_note.get()}</p>
            </fieldset>
            <h3>"Changes to sign-ins"</h3>
            <ol id="people-events">
                {move || events.get().into_iter().map(|e| view! {
                    <li>{format!("{} · {} · {}{} · by {}", e.at.format("%Y-%m-%d %H:%M"), e.username, e.action.replace('_', " "),
                        e.detail.map(|d| format!(" ({d})")).unwrap_or_default(), e.by.unwrap_or_else(|| "the server's command line".into()))}</li>
                }).collect_view()}
            </ol>
            <a href="#review">"← Review"</a>
        </section>
    }
}
