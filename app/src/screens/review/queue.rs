//! The review queue: records in the order that matters, each with why — filtered by
//! state, species or higher taxon, area, dates and flag (folded away on a phone, open on
//! a desk), a page at a time — and the record a reviewer opens from it.

use leptos::prelude::*;
use shared_types::codes::code;
use shared_types::{QueueFlag, QueueItem, Role};

use crate::data::api::{self, QueueFilters};
use crate::data::words::{t, t_args};
use crate::data::{checklist, labels, page, readable};
use crate::screens::review::record::RecordReview;

/// The queue: filters, a page of records in the order that matters with why, and
/// the record opened from it.
#[component]
pub fn Queue(role: Role, signed_out: impl Fn() + Copy + 'static) -> impl IntoView {
    let items = RwSignal::new(Vec::<QueueItem>::new());
    let more = RwSignal::new(false);
    let open = RwSignal::new(None::<String>);
    let filters = RwSignal::new(QueueFilters::default());
    let problem = RwSignal::new(String::new());
    // Only the newest request's answer is shown (filters may change while one is out).
    let asked_last = StoredValue::new(0u32);
    let fetch = move |append: bool| {
        let asked = filters.get_untracked();
        let offset = if append { items.with_untracked(|i| i.len()) } else { 0 };
        let this = asked_last.get_value().wrapping_add(1);
        asked_last.set_value(this);
        leptos::task::spawn_local(async move {
            let answer = api::review_queue(&asked, offset).await;
            if asked_last.get_value() != this {
                return;
            }
            match answer {
                Ok(page) => {
                    more.set(page.more);
                    problem.set(String::new());
                    if append { items.update(|i| i.extend(page.items)) } else { items.set(page.items) }
                }
                Err(err) => problem.set(err.to_string()),
            }
        });
    };
    fetch(false);
    let sign_out = move |_| {
        leptos::task::spawn_local(async move {
            let _ = api::sign_out().await;
            signed_out();
        });
    };
    // Each filter control writes its field; selects and dates apply at once.
    let set = move |field: fn(&mut QueueFilters) -> &mut String, value: String, apply: bool| {
        filters.update(|f| *field(f) = value);
        if apply {
            fetch(false);
        }
    };
    let clear = move |_| {
        filters.set(QueueFilters::default());
        fetch(false);
    };
    view! {
        <div class="row spread">
            {(role == Role::Admin).then(|| view! { <a href="#people">{t("desk-people")}</a> })}
            <button id="queue-sign-out" type="button" class="small" on:click=sign_out>{t("review-sign-out")}</button>
        </div>
        <details id="filters-fold" class="filters-fold" prop:open=page::wide_screen()>
        <summary>{move || filters.with(|f| t_args("queue-filters", &[("set", api::filters_set(f).into())]))}</summary>
        <form id="queue-filters" class="filters" on:submit=move |ev: leptos::ev::SubmitEvent| { ev.prevent_default(); fetch(false); }>
            <label>{t("queue-show")}" "<select id="queue-state" prop:value=move || filters.with(|f| f.state.clone()) on:change=move |ev| set(|f| &mut f.state, event_target_value(&ev), true)>
                <option value="">{t("queue-to-review")}</option>
                <option value="awaiting_review">{t("state-awaiting-review")}</option>
                <option value="details_requested">{t("state-details-requested")}</option>
                <option value="confirmed">{t("state-confirmed")}</option>
                <option value="not_confirmable">{t("state-not-confirmable")}</option>
                <option value="merged">{t("state-merged")}</option>
                <option value="any">{t("queue-all")}</option>
            </select></label>
            <label>{t("queue-taxon")}" "<input id="queue-taxon" list="taxon-names" placeholder=t("queue-taxon-example")
                prop:value=move || filters.with(|f| f.taxon.clone()) on:input=move |ev| set(|f| &mut f.taxon, event_target_value(&ev), false) on:change=move |_| fetch(false) /></label>
            <datalist id="taxon-names">{checklist::known_taxon_names().into_iter().map(|n| view! { <option value=n></option> }).collect_view()}</datalist>
            <label>{t("queue-area")}" "<select id="queue-area" prop:value=move || filters.with(|f| f.area.clone()) on:change=move |ev| set(|f| &mut f.area, event_target_value(&ev), true)>
                <option value="">{t("queue-anywhere")}</option>
                {checklist::areas().into_iter().map(|(code, name)| view! { <option value=code>{name}</option> }).collect_view()}
            </select></label>
            <label>{t("queue-from")}" "<input id="queue-from" type="date" prop:value=move || filters.with(|f| f.from.clone()) on:change=move |ev| set(|f| &mut f.from, event_target_value(&ev), true) /></label>
            <label>{t("queue-to")}" "<input id="queue-to" type="date" prop:value=move || filters.with(|f| f.to.clone()) on:change=move |ev| set(|f| &mut f.to, event_target_value(&ev), true) /></label>
            <label>{t("queue-flag")}" "<select id="queue-flag" prop:value=move || filters.with(|f| f.flag.clone()) on:change=move |ev| set(|f| &mut f.flag, event_target_value(&ev), true)>
                <option value="">{t("queue-any-flag")}</option>
                {QueueFlag::ALL.iter().map(|flag| view! { <option value=code(flag)>{labels::queue_flag(*flag)}</option> }).collect_view()}
            </select></label>
            <div class="actions">
                <button id="queue-apply" type="submit" class="small">{t("queue-filter")}</button>
                <button id="queue-clear" type="button" class="small" on:click=clear>{t("queue-clear")}</button>
            </div>
        </form>
        </details>
        <p class="problems">{move || problem.get()}</p>
        {move || match open.get() {
            Some(id) => view! { <RecordReview client_id=id back=move || { open.set(None); fetch(false); } /> }.into_any(),
            None => view! {
                <p id="queue-count" class="hint">{move || t_args("queue-count", &[("count", items.with(|i| i.len()).into()), ("more", if more.get() { t("queue-more-below") } else { String::new() }.into())])}</p>
                <ol id="queue">
                    {move || items.get().into_iter().map(|item| {
                        let id = item.record.submission.client_id.to_string();
                        let what = item.current_taxon.as_deref().map(|name| checklist::common_name(name).map_or_else(|| name.to_owned(), |common| format!("{common} ({name})")))
                            .or_else(|| item.record.submission.species_guess.as_ref().map(|g| g.as_str().to_owned())).unwrap_or_else(|| t("urgent-unnamed"));
                        let when = readable::day(&item.record.submission.observed_at);
                        let open_id = id.clone();
                        view! {
                            <li class="queue-item" data-client-id=id>
                                <button type="button" class="link" on:click=move |_| open.set(Some(open_id.clone()))>{format!("{what} · {when} · {}", labels::review_state(item.record.review_state))}</button>
                                <ul class="reasons">{item.priority_reasons.iter().map(|r| view! { <li>{labels::priority_reason(r)}</li> }).collect_view()}</ul>
                            </li>
                        }
                    }).collect_view()}
                </ol>
                <Show when=move || more.get()>
                    <button id="queue-more" type="button" on:click=move |_| fetch(true)>{t("queue-load-more")}</button>
                </Show>
            }.into_any(),
        }}
    }
}
