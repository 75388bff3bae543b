//! Times choosing the next question over a generated 500-species checklist, against a
//! naive baseline measured in the same run: ranking every hypothetical answer afresh
//! through the public API and averaging the entropies (what the key would do without
//! its precomputed answer tables and the mutual-information shortcut).
//!
//! Run with `cargo bench -p species-key --bench next_question`.

use std::hint::black_box;
use std::time::{Duration, Instant};

use species_key::likelihood::{answer_likelihood, entropy_bits};
use species_key::{Answers, Context, Key, LengthKind, Measurement};

const SPECIES: usize = 500;
const CHARACTERS: usize = 15;

/// The naive choice: for every unanswered character and state, rank again and take
/// the entropy; weight by the chance of that answer under the current ranking.
fn naive_next_question(key: &Key, answers: &Answers, context: &Context) -> Option<String> {
    let checklist = key.checklist();
    let now = key.rank(answers, context).ok()?;
    let mut best: Option<(String, f64)> = None;
    for character in checklist.characters().iter().filter(|c| answers.get(&c.name).is_none()) {
        let states = character.states.len();
        let mut expected = 0.0;
        for (s, state) in character.states.iter().enumerate() {
            let chance: f64 = now
                .iter()
                .map(|c| {
                    let taxon = checklist.taxon(&c.scientific_name).unwrap();
                    let allowed = taxon.characters[&character.name].iter().fold(0u64, |set, name| {
                        set | 1 << character.states.iter().position(|k| &k.name == name).unwrap()
                    });
                    c.probability * answer_likelihood(allowed, states, s)
                })
                .sum();
            let after = key.rank(&answers.clone().with(&character.name, &state.name), context).ok()?;
            expected += chance * entropy_bits(after.iter().map(|c| c.probability));
        }
        if best.as_ref().is_none_or(|(_, e)| expected < *e) {
            best = Some((character.name.clone(), expected));
        }
    }
    best.map(|(name, _)| name)
}

fn median_time(runs: usize, mut task: impl FnMut()) -> Duration {
    let mut times: Vec<Duration> = (0..runs)
        .map(|_| {
            let start = Instant::now();
            task();
            start.elapsed()
        })
        .collect();
    times.sort();
    times[runs / 2]
}

fn main() {
    let checklist = species_key::synthetic::checklist(SPECIES, CHARACTERS, 2026);
    let build = median_time(11, || {
        black_box(Key::new(black_box(&checklist)));
    });
    let key = Key::new(&checklist);
    let context = Context::default();
    let answers = Answers::new().with("c0", "s1").with("c3", "s2");

    let fast_choice = key.next_question(&answers, &context).unwrap().map(|q| q.character);
    let naive_choice = naive_next_question(&key, &answers, &context);
    assert_eq!(fast_choice, naive_choice, "both ways must choose the same question");

    let fast = median_time(201, || {
        black_box(key.next_question(black_box(&answers), &context).unwrap());
    });
    let rank = median_time(51, || {
        black_box(key.rank(black_box(&answers), &context).unwrap());
    });
    let measured = Context {
        area_code: Some("a".into()),
        measurement: Some(Measurement { kind: LengthKind::ForkLength, cm: 180.0, estimated: false }),
        ..Context::default()
    };
    let fast_measured = median_time(201, || {
        black_box(key.next_question(black_box(&answers), &measured).unwrap());
    });
    let naive = median_time(11, || {
        black_box(naive_next_question(&key, black_box(&answers), &context));
    });
    println!("checklist: {SPECIES} species, {CHARACTERS} characters, 2 answered");
    println!("Key::new                 median {build:?}");
    println!("rank (with reasons)      median {rank:?}");
    println!("next_question            median {fast:?}");
    println!("  with area and length   median {fast_measured:?}");
    println!("naive next question      median {naive:?}");
    println!("naive / next_question    {:.0}×", naive.as_secs_f64() / fast.as_secs_f64());
    println!(
        "bench-row | key: next question, {SPECIES} species, native (`species-key/benches/next_question.rs`) | {fast:?} median ({fast_measured:?} with area and length) | naive re-ranking: {naive:?} | {:.0}× faster | —",
        naive.as_secs_f64() / fast.as_secs_f64()
    );
}
