//! The response log of a live animal (who went, when, what happened, notes, and who
//! logged it when) and the form to add to it, on the live-animal list and on the record.

use leptos::prelude::*;
use shared_types::{ResponseOutcome, ResponseView};

use crate::data::fieldwork::{FormProblem, ResponseDraft, code_of};
use crate::data::time::{self, BrowserZone};
use crate::data::words::{t, t_args};
use crate::data::{api, labels, readable};
use crate::screens::fieldwork::notes::{field_note, form_note};

/// The responses so far, oldest first.
#[component]
pub fn ResponseLog(responses: Vec<ResponseView>) -> impl IntoView {
    let empty = responses.is_empty();
    let rows = responses
        .into_iter()
        .map(|r| {
            let notes = r.notes.map(|n| format!(" — {n}")).unwrap_or_default();
            let went =
                t_args("response-went", &[("who", r.who_went.into()), ("at", readable::time(&r.went_at).into())]);
            let logged = t_args(
                "response-logged-by",
                &[("who", r.logged_by.into()), ("at", readable::utc_minute(&r.logged_at).into())],
            );
            view! {
                <li class="response" data-outcome=code_of(&r.outcome)>
                    <b>{labels::response_outcome(r.outcome)}</b>{format!("{went}{notes}")}
                    <span class="hint">{logged}</span>
                </li>
            }
        })
        .collect_view();
    view! {
        <h4>{t("response-log-heading")}</h4>
        {empty.then(|| view! { <p class="hint">{t("response-none")}</p> })}
        <ol class="response-log">{rows}</ol>
    }
}

/// The form to log a response to the record `client_id`; `done` runs once it is stored.
#[component]
pub fn ResponseForm(client_id: String, done: impl Fn() + Copy + Send + Sync + 'static) -> impl IntoView {
    let draft = RwSignal::new(ResponseDraft { went_at: time::now_for_input(), ..Default::default() });
    let problem = RwSignal::new(None::<FormProblem>);
    let note = RwSignal::new(String::new());
    let submit = move |ev: leptos::ev::SubmitEvent| {
        ev.prevent_default();
        note.set(String::new());
        let report = match draft.with_untracked(|d| d.to_report(&BrowserZone, chrono::Utc::now())) {
            Ok(report) => report,
            Err(p) => return problem.set(Some(p)),
        };
        let id = client_id.clone();
        leptos::task::spawn_local(async move {
            match api::fieldwork::log_response(&id, &report).await {
                Ok(()) => {
                    problem.set(None);
                    note.set(t("response-saved"));
                    done();
                }
                Err(err) => problem.set(Some(FormProblem::from_server(&err))),
            }
        });
    };
    let set = move |field: fn(&mut ResponseDraft) -> &mut String| {
        move |ev| draft.update(|d| *field(d) = event_target_value(&ev))
    };
    view! {
        <form id="response-form" class="fieldwork-form" on:submit=submit>
            <label>{t("response-who")}<input id="response-who" prop:value=move || draft.with(|d| d.who_went.clone()) on:input=set(|d| &mut d.who_went) /></label>
            {field_note(problem, "who_went")}
            <label>{t("response-when")}<input id="response-when" type="datetime-local" prop:value=move || draft.with(|d| d.went_at.clone()) on:input=set(|d| &mut d.went_at) /></label>
            {field_note(problem, "went_at")}
            <label>{t("response-outcome")}<select id="response-outcome" prop:value=move || draft.with(|d| d.outcome.clone()) on:change=set(|d| &mut d.outcome)>
                <option value="">{t("response-choose")}</option>
                {ResponseOutcome::ALL.iter().map(|o| view! { <option value=code_of(o)>{labels::response_outcome(*o)}</option> }).collect_view()}
            </select></label>
            {field_note(problem, "outcome")}
            <label>{t("response-notes")}<textarea id="response-notes" rows="2" prop:value=move || draft.with(|d| d.notes.clone()) on:input=set(|d| &mut d.notes)></textarea></label>
            {field_note(problem, "notes")}
            <button id="response-save" type="submit" class="primary">{t("response-save")}</button>
            {form_note(problem, ResponseDraft::FIELDS)}
            <p id="response-note" class="note" role="status">{move || note.get()}</p>
        </form>
    }
}
