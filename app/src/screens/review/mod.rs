//! The reviewers' screens (`#review`): the queue ([`queue`]) and one
//! record at a time with everything needed to decide ([`record`]: photos that open
//! large and zoom ([`zoom`]), times and places, the guided key's answers, possible
//! duplicates ([`duplicates`]), history, and the actions). Needs a connection: review
//! happens at a desk, and the server decides. The desk's page signs the reviewer in.

mod duplicates;
mod queue;
mod record;
mod zoom;

use leptos::prelude::*;
use shared_types::Role;

use crate::data::words::t;
use crate::screens::review::queue::Queue;

/// The queue for a signed-in reviewer or admin (`role`); `signed_out` is called after
/// the queue's Sign out.
#[component]
pub fn ReviewScreen(role: Role, signed_out: impl Fn() + Copy + 'static) -> impl IntoView {
    view! {
        <section class="card review">
            <h2>{t("review-heading")}</h2>
            <p class="hint">{t("review-decisions-kept")}</p>
            <Queue role=role signed_out=signed_out />
        </section>
    }
}
