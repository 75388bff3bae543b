//! What the people who go out added to a record, on the reviewer's record screen: for a
//! live animal the cautions, how the responders were told and the response log with its
//! form; for every record the samples and the carcass report.

use leptos::prelude::*;
use shared_types::ReviewDetail;

use crate::data::fieldwork::notification_words;
use crate::data::words::t;
use crate::screens::fieldwork::carcass::CarcassSection;
use crate::screens::fieldwork::response::{ResponseForm, ResponseLog};
use crate::screens::fieldwork::samples::SamplesSection;

#[component]
pub fn RecordFieldwork(detail: ReviewDetail, reload: impl Fn() + Copy + Send + Sync + 'static) -> impl IntoView {
    let id = detail.record.submission.client_id.to_string();
    let live = detail.urgent.then(|| {
        let told = if detail.notifications.is_empty() {
            view! { <p class="hint">{t("urgent-not-told")}</p> }.into_any()
        } else {
            let lines = detail.notifications.iter().map(|n| view! { <li>{notification_words(n)}</li> }).collect_view();
            view! { <ul class="notifications">{lines}</ul> }.into_any()
        };
        view! {
            <section id="record-live" class="fieldwork live-animal">
                <h4>{t("on-record-live")}</h4>
                <p class="safety"><b>{t("on-record-caution")}</b></p>
                {told}
                <ResponseLog responses=detail.responses.clone() />
                <ResponseForm client_id=id.clone() done=reload />
            </section>
        }
    });
    view! {
        {live}
        <SamplesSection client_id=id.clone() samples=detail.samples.clone() reload=reload />
        <CarcassSection client_id=id carcass=detail.carcass.clone() reload=reload />
    }
}
