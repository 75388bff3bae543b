//! `#people`: the admin's screen to add reviewers and admins, change their role, set a
//! new password, turn sign-ins off and on, and read the trail of those changes.

use leptos::prelude::*;
use shared_types::{PersonEvent, Role};

use crate::data::api::{self, StaffPerson};
use crate::data::words::{t, t_args};
use crate::data::{labels, readable};

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
            changed(
                outcome,
                t_args("people-now-role", &[("who", who.into()), ("role", labels::role_code(&role).into())]),
            );
        });
    };
    let reset = move |_| {
        let (who, password) = (password_name.clone(), new_password.get_untracked());
        new_password.set(String::new());
        leptos::task::spawn_local(async move {
            let outcome = api::set_password(&who, password).await;
            changed(outcome, t_args("people-new-password", &[("who", who.into())]));
        });
    };
    let turn_to = !person.disabled;
    let toggle = move |_| {
        let who = toggle_name.clone();
        leptos::task::spawn_local(async move {
            let outcome = api::set_disabled(&who, turn_to).await;
            let done = if turn_to {
                t_args("people-turned-off", &[("who", who.into())])
            } else {
                t_args("people-turned-on", &[("who", who.into())])
            };
            changed(outcome, done);
        });
    };
    view! {
        <li class="person" data-username=name.clone()>
            <span class="who">{format!("{name} · {} · {}{}", labels::role_code(person.role.code()), person.display_name.clone().unwrap_or_default(), if person.disabled { t("people-off-mark") } else { String::new() })}</span>
            <label>{t("people-role")}" "<select class="person-role" on:change=change_role>
                <option value="reviewer" selected=person.role == Role::Reviewer>{t("role-reviewer")}</option>
                <option value="admin" selected=person.role == Role::Admin>{t("role-admin")}</option>
            </select></label>
            <label>{t("people-new-password-label")}" "<input class="person-password" type="password" autocomplete="new-password" prop:value=move || new_password.get() on:input=move |ev| new_password.set(event_target_value(&ev)) /></label>
            <button type="button" class="small person-reset" on:click=reset>{t("people-set-password")}</button>
            <button type="button" class="small person-toggle" on:click=toggle>{if person.disabled { t("people-turn-on") } else { t("people-turn-off") }}</button>
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
    let form = RwSignal::new((String::new(), String::new(), String::new(), Role::Reviewer.code().to_owned()));
    let reload = move || {
        leptos::task::spawn_local(async move {
            match api::people().await {
                Ok(list) => people.set(list),
                Err(err) => problem.set(t_args("people-sign-in-first", &[("problem", err.to_string().into())])),
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
            t_args("people-added", &[("who", username.clone().into()), ("role", labels::role_code(&role).into())]);
        leptos::task::spawn_local(async move {
            match api::add_person(username, display_name, password, role).await {
                Ok(()) => {
                    form.set((String::new(), String::new(), String::new(), Role::Reviewer.code().into()));
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
            <h2>{t("desk-people")}</h2>
            <p class="hint">{t("people-hint")}</p>
            <p class="problems" role="alert">{move || problem.get()}</p>
            <p id="people-note" class="hint">{move || note.get()}</p>
            <ul id="people-list">
                {move || people.get().into_iter().map(|p| view! { <PersonRow person=p reload=reload problem=problem note=note /> }).collect_view()}
            </ul>
            <fieldset>
                <legend>{t("people-add-legend")}</legend>
                <div class="row">
                    <label>{t("sign-in-username")}" "<input id="new-username" prop:value=move || form.with(|f| f.0.clone()) on:input=move |ev| form.update(|f| f.0 = event_target_value(&ev)) /></label>
                    <label>{t("people-name-shown")}" "<input id="new-display-name" prop:value=move || form.with(|f| f.1.clone()) on:input=move |ev| form.update(|f| f.1 = event_target_value(&ev)) /></label>
                </div>
                <div class="row">
                    <label>{t("people-password")}" "<input id="new-password" type="password" autocomplete="new-password" prop:value=move || form.with(|f| f.2.clone()) on:input=move |ev| form.update(|f| f.2 = event_target_value(&ev)) /></label>
                    <label>{t("people-role")}" "<select id="new-role" on:change=move |ev| form.update(|f| f.3 = event_target_value(&ev))>
                        <option value="reviewer">{t("role-reviewer")}</option>
                        <option value="admin">{t("role-admin")}</option>
                    </select></label>
                </div>
                <button id="add-person" type="button" class="primary" on:click=add>{t("people-add")}</button>
                <p id="add-problem" class="problems" role="alert">{move || add_problem.get()}</p>
                <p id="add-note" class="hint" role="status">{move || add_note.get()}</p>
            </fieldset>
            <h3>{t("people-changes")}</h3>
            <ol id="people-events">
                {move || events.get().into_iter().map(|e| view! {
                    <li>{t_args("people-event", &[("at", readable::minute(&e.at).into()), ("who", e.username.into()), ("action", labels::person_event(&e.action, e.detail.as_deref()).into()),
                        ("by", e.by.unwrap_or_else(|| t("people-command-line")).into())])}</li>
                }).collect_view()}
            </ol>
            <a href="#review">{t("people-back")}</a>
        </section>
    }
}
