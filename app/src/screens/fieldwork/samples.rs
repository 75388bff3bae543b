//! Samples taken from a record's animal: each with its kind, code, preservation, where
//! it is stored, who holds it and notes, who added it and when; a form to add one and
//! to change one (the server keeps the trail of each change).

use leptos::prelude::*;
use shared_types::{Preservation, SampleKind, SampleView};

use crate::data::api;
use crate::data::fieldwork::{FormProblem, SampleDraft, code_of};
use crate::screens::fieldwork::notes::{field_note, form_note};

mod words {
    pub const HEADING: &str = "Samples";
    pub const NONE: &str = "No samples yet.";
    pub const KIND: &str = "Kind";
    pub const CODE: &str = "Sample id or barcode (type or scan)";
    pub const PRESERVATION: &str = "Preservation";
    pub const STORED_AT: &str = "Where it is stored";
    pub const HELD_BY: &str = "Who holds it";
    pub const NOTES: &str = "Notes";
    pub const CHOOSE: &str = "choose…";
    pub const ADD: &str = "Add the sample";
    pub const SAVE_CHANGE: &str = "Save the change";
    pub const CHANGE: &str = "Change";
    pub const CANCEL: &str = "Cancel the change";
    pub const ADDED: &str = "Sample added.";
    pub const CHANGED: &str = "Sample changed.";
    pub const ADD_LEGEND: &str = "Add a sample";
    pub const CHANGE_LEGEND: &str = "Change sample";
}

/// One sample as a line: what, how kept, where, who, and the trail's who and when.
pub fn sample_line(s: &SampleView) -> String {
    let notes = s.notes.as_ref().map(|n| format!(" — {n}")).unwrap_or_default();
    let changed = s.changed_at.map(|at| format!("; changed {}", at.format("%Y-%m-%d %H:%M UTC"))).unwrap_or_default();
    format!(
        "{} · {} · {} · stored at {} · held by {}{notes} (added by {} on {}{changed})",
        s.code,
        s.kind.label(),
        s.preservation.label(),
        s.stored_at,
        s.held_by,
        s.added_by,
        s.added_at.format("%Y-%m-%d %H:%M UTC")
    )
}

/// The samples of the animal of `client_id`, and the form; `reload` after a change.
#[component]
pub fn SamplesSection(
    client_id: String,
    samples: Vec<SampleView>,
    reload: impl Fn() + Copy + Send + Sync + 'static,
) -> impl IntoView {
    let draft = RwSignal::new(SampleDraft::default());
    // The code of the sample being changed; `None` while adding.
    let changing = RwSignal::new(None::<String>);
    let problem = RwSignal::new(None::<FormProblem>);
    let note = RwSignal::new(String::new());
    let submit = move |ev: leptos::ev::SubmitEvent| {
        ev.prevent_default();
        note.set(String::new());
        let input = match draft.with_untracked(SampleDraft::to_input) {
            Ok(input) => input,
            Err(p) => return problem.set(Some(p)),
        };
        let (id, current) = (client_id.clone(), changing.get_untracked());
        leptos::task::spawn_local(async move {
            let outcome = match &current {
                Some(code) => api::fieldwork::change_sample(code, &input).await,
                None => api::fieldwork::add_sample(&id, &input).await,
            };
            match outcome {
                Ok(()) => {
                    problem.set(None);
                    draft.set(SampleDraft::default());
                    changing.set(None);
                    note.set(if current.is_some() { words::CHANGED } else { words::ADDED }.into());
                    reload();
                }
                Err(err) => problem.set(Some(FormProblem::from_server(&err))),
            }
        });
    };
    let empty = samples.is_empty();
    let rows = samples
        .into_iter()
        .map(|s| {
            let code = s.code.clone();
            let line = sample_line(&s);
            let start_change = move |_| {
                draft.set(SampleDraft::from_view(&s));
                changing.set(Some(s.code.clone()));
                problem.set(None);
            };
            view! {
                <li class="sample" data-code=code.clone()>
                    <span class="sample-line">{line}</span>
                    <button type="button" class="small sample-change" on:click=start_change>{words::CHANGE}</button>
                </li>
            }
        })
        .collect_view();
    let set = move |field: fn(&mut SampleDraft) -> &mut String| {
        move |ev: leptos::ev::Event| draft.update(|d| *field(d) = event_target_value(&ev))
    };
    let cancel = move |_| {
        changing.set(None);
        draft.set(SampleDraft::default());
        problem.set(None);
    };
    view! {
        <section id="samples" class="fieldwork">
            <h4>{words::HEADING}</h4>
            {empty.then(|| view! { <p class="hint">{words::NONE}</p> })}
            <ul id="samples-list" class="plain">{rows}</ul>
            <form id="sample-form" class="fieldwork-form" on:submit=submit>
                <fieldset>
                    <legend>{move || match changing.get() { Some(code) => format!("{} {code}", words::CHANGE_LEGEND), None => words::ADD_LEGEND.to_owned() }}</legend>
                    <label>{words::KIND}<select id="sample-kind" prop:value=move || draft.with(|d| d.kind.clone()) on:change=set(|d| &mut d.kind)>
                        <option value="">{words::CHOOSE}</option>
                        {SampleKind::ALL.iter().map(|k| view! { <option value=code_of(k)>{k.label()}</option> }).collect_view()}
                    </select></label>
                    {field_note(problem, "kind")}
                    <label>{words::CODE}<input id="sample-code" autocomplete="off" prop:value=move || draft.with(|d| d.code.clone()) on:input=set(|d| &mut d.code) /></label>
                    {field_note(problem, "code")}
                    <label>{words::PRESERVATION}<select id="sample-preservation" prop:value=move || draft.with(|d| d.preservation.clone()) on:change=set(|d| &mut d.preservation)>
                        <option value="">{words::CHOOSE}</option>
                        {Preservation::ALL.iter().map(|p| view! { <option value=code_of(p)>{p.label()}</option> }).collect_view()}
                    </select></label>
                    {field_note(problem, "preservation")}
                    <label>{words::STORED_AT}<input id="sample-stored" prop:value=move || draft.with(|d| d.stored_at.clone()) on:input=set(|d| &mut d.stored_at) /></label>
                    {field_note(problem, "stored_at")}
                    <label>{words::HELD_BY}<input id="sample-held" prop:value=move || draft.with(|d| d.held_by.clone()) on:input=set(|d| &mut d.held_by) /></label>
                    {field_note(problem, "held_by")}
                    <label>{words::NOTES}<textarea id="sample-notes" rows="2" prop:value=move || draft.with(|d| d.notes.clone()) on:input=set(|d| &mut d.notes)></textarea></label>
                    {field_note(problem, "notes")}
                    <div class="actions">
                        <button id="sample-save" type="submit" class="primary">{move || if changing.with(Option::is_some) { words::SAVE_CHANGE } else { words::ADD }}</button>
                        <Show when=move || changing.with(Option::is_some)>
                            <button id="sample-cancel" type="button" on:click=cancel>{words::CANCEL}</button>
                        </Show>
                    </div>
                    {form_note(problem, SampleDraft::FIELDS)}
                    <p id="sample-note" class="note" role="status">{move || note.get()}</p>
                </fieldset>
            </form>
        </section>
    }
}
