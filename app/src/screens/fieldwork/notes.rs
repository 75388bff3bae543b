//! A form's problem shown beside the control it names (the field as the server names
//! it), and under the form when it names none the form has.

use leptos::prelude::*;

use crate::data::fieldwork::FormProblem;

/// The problem's words when it is about `field`.
pub fn field_note(problem: RwSignal<Option<FormProblem>>, field: &'static str) -> impl IntoView {
    move || {
        problem.with(|p| {
            p.as_ref().filter(|p| p.field == field).map(|p| {
                view! { <p class="problems field-problem" role="alert" data-field=field>{p.words.clone()}</p> }
            })
        })
    }
}

/// The problem's words when it names none of `fields` (a refusal about the whole form).
pub fn form_note(problem: RwSignal<Option<FormProblem>>, fields: &'static [&'static str]) -> impl IntoView {
    move || {
        problem.with(|p| {
            p.as_ref().filter(|p| !fields.contains(&p.field.as_str())).map(|p| {
                view! { <p class="problems field-problem" role="alert" data-field=p.field.clone()>{p.words.clone()}</p> }
            })
        })
    }
}
