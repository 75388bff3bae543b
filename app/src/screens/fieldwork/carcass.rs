//! The carcass's fate and what an examination found — body condition, stomach, injuries
//! (structured) and free notes — with who recorded it and when, and the form to record
//! or correct it (a correction replaces it; the server's trail keeps both).

use leptos::prelude::*;
use shared_types::{CarcassFate, CarcassView};

use crate::data::fieldwork::{BODY_CONDITIONS, CarcassDraft, FormProblem, STOMACH_FILLS, code_of};
use crate::data::time::BrowserZone;
use crate::data::words::{t, t_args};
use crate::data::{api, labels, readable};
use crate::screens::fieldwork::notes::{field_note, form_note};

/// The stored report in words, one finding a line.
fn report_lines(carcass: &CarcassView) -> Vec<String> {
    let r = &carcass.report;
    let not_said = || t("carcass-not-said");
    let mut lines = vec![t_args("carcass-shown-fate", &[("value", labels::carcass_fate(r.fate).into())])];
    if let Some(at) = r.examined_at {
        lines.push(t_args("carcass-shown-examined", &[("value", readable::time(&at).into())]));
    }
    let condition = r.body_condition.map_or_else(not_said, labels::body_condition);
    lines.push(t_args("carcass-shown-condition", &[("value", condition.into())]));
    lines.push(t_args("carcass-shown-stomach", &[("value", r.stomach.map_or_else(not_said, labels::stomach).into())]));
    lines.extend(r.injuries.as_ref().map(|text| t_args("carcass-shown-injuries", &[("value", text.as_str().into())])));
    lines.extend(r.notes.as_ref().map(|text| t_args("carcass-shown-notes", &[("value", text.as_str().into())])));
    lines.push(t_args(
        "carcass-recorded-by",
        &[("who", carcass.recorded_by.clone().into()), ("at", readable::utc_minute(&carcass.recorded_at).into())],
    ));
    lines
}

#[component]
pub fn CarcassSection(
    client_id: String,
    carcass: Option<CarcassView>,
    reload: impl Fn() + Copy + Send + Sync + 'static,
) -> impl IntoView {
    let draft = RwSignal::new(carcass.as_ref().map(|c| CarcassDraft::from_view(c, &BrowserZone)).unwrap_or_default());
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
            match api::fieldwork::set_carcass(&id, &report).await {
                Ok(()) => {
                    problem.set(None);
                    note.set(t("carcass-saved"));
                    reload();
                }
                Err(err) => problem.set(Some(FormProblem::from_server(&err))),
            }
        });
    };
    let shown = match &carcass {
        Some(c) => {
            let lines = report_lines(c).into_iter().map(|l| view! { <li>{l}</li> }).collect_view();
            view! { <ul id="carcass-shown" class="plain">{lines}</ul> }.into_any()
        }
        None => view! { <p class="hint">{t("carcass-none")}</p> }.into_any(),
    };
    let set = move |field: fn(&mut CarcassDraft) -> &mut String| {
        move |ev: leptos::ev::Event| draft.update(|d| *field(d) = event_target_value(&ev))
    };
    view! {
        <section id="carcass" class="fieldwork">
            <h4>{t("carcass-heading")}</h4>
            {shown}
            <form id="carcass-form" class="fieldwork-form" on:submit=submit>
                <label>{t("carcass-fate")}<select id="carcass-fate" prop:value=move || draft.with(|d| d.fate.clone()) on:change=set(|d| &mut d.fate)>
                    <option value="">{t("response-choose")}</option>
                    {CarcassFate::ALL.iter().map(|f| view! { <option value=code_of(f)>{labels::carcass_fate(*f)}</option> }).collect_view()}
                </select></label>
                {field_note(problem, "fate")}
                <label>{t("carcass-examined")}<input id="carcass-examined" type="datetime-local" prop:value=move || draft.with(|d| d.examined_at.clone()) on:input=set(|d| &mut d.examined_at) /></label>
                {field_note(problem, "examined_at")}
                <label>{t("carcass-condition")}<select id="carcass-condition" prop:value=move || draft.with(|d| d.body_condition.clone()) on:change=set(|d| &mut d.body_condition)>
                    <option value="">{t("carcass-not-said")}</option>
                    {BODY_CONDITIONS.iter().map(|c| view! { <option value=code_of(c)>{labels::body_condition(*c)}</option> }).collect_view()}
                </select></label>
                {field_note(problem, "body_condition")}
                <label>{t("carcass-stomach")}<select id="carcass-stomach" prop:value=move || draft.with(|d| d.stomach.clone()) on:change=set(|d| &mut d.stomach)>
                    <option value="">{t("carcass-not-said")}</option>
                    {STOMACH_FILLS.iter().map(|s| view! { <option value=code_of(s)>{labels::stomach(*s)}</option> }).collect_view()}
                </select></label>
                {field_note(problem, "stomach")}
                <label>{t("carcass-injuries")}<textarea id="carcass-injuries" rows="2" prop:value=move || draft.with(|d| d.injuries.clone()) on:input=set(|d| &mut d.injuries)></textarea></label>
                {field_note(problem, "injuries")}
                <label>{t("carcass-notes")}<textarea id="carcass-notes" rows="2" prop:value=move || draft.with(|d| d.notes.clone()) on:input=set(|d| &mut d.notes)></textarea></label>
                {field_note(problem, "notes")}
                <button id="carcass-save" type="submit" class="primary">{t("carcass-save")}</button>
                {form_note(problem, CarcassDraft::FIELDS)}
                <p id="carcass-note" class="note" role="status">{move || note.get()}</p>
            </form>
        </section>
    }
}
