//! Samples taken from a record's animal: each with its kind, code, preservation, where
//! it is stored, who holds it and notes, who added it and when; a form to add one and
//! to change one (the server keeps the trail of each change).

use leptos::prelude::*;
use shared_types::{Preservation, SampleKind, SampleView};

use crate::data::fieldwork::{FormProblem, SampleDraft, code_of};
use crate::data::words::{t, t_args};
use crate::data::{api, labels, readable};
use crate::screens::fieldwork::notes::{field_note, form_note};

/// One sample as a line: what, how kept, where, who, and the trail's who and when.
pub fn sample_line(s: &SampleView) -> String {
    let notes = s.notes.as_ref().map(|n| format!(" — {n}")).unwrap_or_default();
    let changed = s
        .changed_at
        .map(|at| t_args("samples-changed-at", &[("at", readable::utc_minute(&at).into())]))
        .unwrap_or_default();
    t_args(
        "samples-line",
        &[
            ("code", s.code.clone().into()),
            ("kind", labels::sample_kind(s.kind).into()),
            ("preservation", labels::preservation(s.preservation).into()),
            ("stored_at", s.stored_at.clone().into()),
            ("held_by", s.held_by.clone().into()),
            ("notes", notes.into()),
            ("added_by", s.added_by.clone().into()),
            ("added_at", readable::utc_minute(&s.added_at).into()),
            ("changed", changed.into()),
        ],
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
                    note.set(if current.is_some() { t("samples-changed") } else { t("samples-added") });
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
                    <button type="button" class="small sample-change" on:click=start_change>{t("samples-change")}</button>
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
            <h4>{t("samples-heading")}</h4>
            {empty.then(|| view! { <p class="hint">{t("samples-none")}</p> })}
            <ul id="samples-list" class="plain">{rows}</ul>
            <form id="sample-form" class="fieldwork-form" on:submit=submit>
                <fieldset>
                    <legend>{move || match changing.get() { Some(code) => t_args("samples-change-legend", &[("code", code.into())]), None => t("samples-add-legend") }}</legend>
                    <label>{t("samples-kind")}<select id="sample-kind" prop:value=move || draft.with(|d| d.kind.clone()) on:change=set(|d| &mut d.kind)>
                        <option value="">{t("response-choose")}</option>
                        {SampleKind::ALL.iter().map(|k| view! { <option value=code_of(k)>{labels::sample_kind(*k)}</option> }).collect_view()}
                    </select></label>
                    {field_note(problem, "kind")}
                    <label>{t("samples-code")}<input id="sample-code" autocomplete="off" prop:value=move || draft.with(|d| d.code.clone()) on:input=set(|d| &mut d.code) /></label>
                    {field_note(problem, "code")}
                    <label>{t("samples-preservation")}<select id="sample-preservation" prop:value=move || draft.with(|d| d.preservation.clone()) on:change=set(|d| &mut d.preservation)>
                        <option value="">{t("response-choose")}</option>
                        {Preservation::ALL.iter().map(|p| view! { <option value=code_of(p)>{labels::preservation(*p)}</option> }).collect_view()}
                    </select></label>
                    {field_note(problem, "preservation")}
                    <label>{t("samples-stored-at")}<input id="sample-stored" prop:value=move || draft.with(|d| d.stored_at.clone()) on:input=set(|d| &mut d.stored_at) /></label>
                    {field_note(problem, "stored_at")}
                    <label>{t("samples-held-by")}<input id="sample-held" prop:value=move || draft.with(|d| d.held_by.clone()) on:input=set(|d| &mut d.held_by) /></label>
                    {field_note(problem, "held_by")}
                    <label>{t("response-notes")}<textarea id="sample-notes" rows="2" prop:value=move || draft.with(|d| d.notes.clone()) on:input=set(|d| &mut d.notes)></textarea></label>
                    {field_note(problem, "notes")}
                    <div class="actions">
                        <button id="sample-save" type="submit" class="primary">{move || if changing.with(Option::is_some) { t("samples-save-change") } else { t("samples-add") }}</button>
                        <Show when=move || changing.with(Option::is_some)>
                            <button id="sample-cancel" type="button" on:click=cancel>{t("samples-cancel")}</button>
                        </Show>
                    </div>
                    {form_note(problem, SampleDraft::FIELDS)}
                    <p id="sample-note" class="note" role="status">{move || note.get()}</p>
                </fieldset>
            </form>
        </section>
    }
}
