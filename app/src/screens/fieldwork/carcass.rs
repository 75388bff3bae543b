//! The carcass's fate and what an examination found — body condition, stomach, injuries
//! (structured) and free notes — with who recorded it and when, and the form to record
//! or correct it (a correction replaces it; the server's trail keeps both).

use leptos::prelude::*;
use shared_types::{CarcassFate, CarcassView};

use crate::data::api;
use crate::data::fieldwork::{
    BODY_CONDITIONS, CarcassDraft, FormProblem, STOMACH_FILLS, body_condition_label, code_of, stomach_label,
};
use crate::data::readable;
use crate::data::time::BrowserZone;
use crate::screens::fieldwork::notes::{field_note, form_note};

mod words {
    pub const HEADING: &str = "Carcass and necropsy";
    pub const NONE: &str = "Nothing recorded about the carcass yet.";
    pub const FATE: &str = "What became of the carcass";
    pub const EXAMINED: &str = "Examined on (leave empty if not examined)";
    pub const CONDITION: &str = "Body condition";
    pub const STOMACH: &str = "Stomach";
    pub const INJURIES: &str = "Injuries: wounds, hooks, net marks, disease";
    pub const NOTES: &str = "Other findings and notes";
    pub const CHOOSE: &str = "choose…";
    pub const NOT_SAID: &str = "not recorded";
    pub const SAVE: &str = "Save the carcass report";
    pub const SAVED: &str = "Carcass report saved.";
    pub const RECORDED_BY: &str = "recorded by";
}

/// The stored report in words, one finding a line.
fn report_lines(carcass: &CarcassView) -> Vec<String> {
    let r = &carcass.report;
    let mut lines = vec![format!("fate: {}", r.fate.label())];
    if let Some(at) = r.examined_at {
        lines.push(format!("examined: {}", readable::time(&at)));
    }
    lines.push(format!("body condition: {}", r.body_condition.map_or(words::NOT_SAID, body_condition_label)));
    lines.push(format!("stomach: {}", r.stomach.map_or(words::NOT_SAID, stomach_label)));
    lines.extend(r.injuries.as_ref().map(|t| format!("injuries: {}", t.as_str())));
    lines.extend(r.notes.as_ref().map(|t| format!("notes: {}", t.as_str())));
    lines.push(format!(
        "{} {} on {}",
        words::RECORDED_BY,
        carcass.recorded_by,
        carcass.recorded_at.format("%Y-%m-%d %H:%M UTC")
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
                    note.set(words::SAVED.into());
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
        None => view! { <p class="hint">{words::NONE}</p> }.into_any(),
    };
    let set = move |field: fn(&mut CarcassDraft) -> &mut String| {
        move |ev: leptos::ev::Event| draft.update(|d| *field(d) = event_target_value(&ev))
    };
    view! {
        <section id="carcass" class="fieldwork">
            <h4>{words::HEADING}</h4>
            {shown}
            <form id="carcass-form" class="fieldwork-form" on:submit=submit>
                <label>{words::FATE}<select id="carcass-fate" prop:value=move || draft.with(|d| d.fate.clone()) on:change=set(|d| &mut d.fate)>
                    <option value="">{words::CHOOSE}</option>
                    {CarcassFate::ALL.iter().map(|f| view! { <option value=code_of(f)>{f.label()}</option> }).collect_view()}
                </select></label>
                {field_note(problem, "fate")}
                <label>{words::EXAMINED}<input id="carcass-examined" type="datetime-local" prop:value=move || draft.with(|d| d.examined_at.clone()) on:input=set(|d| &mut d.examined_at) /></label>
                {field_note(problem, "examined_at")}
                <label>{words::CONDITION}<select id="carcass-condition" prop:value=move || draft.with(|d| d.body_condition.clone()) on:change=set(|d| &mut d.body_condition)>
                    <option value="">{words::NOT_SAID}</option>
                    {BODY_CONDITIONS.iter().map(|c| view! { <option value=code_of(c)>{body_condition_label(*c)}</option> }).collect_view()}
                </select></label>
                {field_note(problem, "body_condition")}
                <label>{words::STOMACH}<select id="carcass-stomach" prop:value=move || draft.with(|d| d.stomach.clone()) on:change=set(|d| &mut d.stomach)>
                    <option value="">{words::NOT_SAID}</option>
                    {STOMACH_FILLS.iter().map(|s| view! { <option value=code_of(s)>{stomach_label(*s)}</option> }).collect_view()}
                </select></label>
                {field_note(problem, "stomach")}
                <label>{words::INJURIES}<textarea id="carcass-injuries" rows="2" prop:value=move || draft.with(|d| d.injuries.clone()) on:input=set(|d| &mut d.injuries)></textarea></label>
                {field_note(problem, "injuries")}
                <label>{words::NOTES}<textarea id="carcass-notes" rows="2" prop:value=move || draft.with(|d| d.notes.clone()) on:input=set(|d| &mut d.notes)></textarea></label>
                {field_note(problem, "notes")}
                <button id="carcass-save" type="submit" class="primary">{words::SAVE}</button>
                {form_note(problem, CarcassDraft::FIELDS)}
                <p id="carcass-note" class="note" role="status">{move || note.get()}</p>
            </form>
        </section>
    }
}
