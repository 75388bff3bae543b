//! The multi-access key: ranks a checklist's species by posterior probability given
//! the answers and the record's context, and picks the question whose answer is
//! expected to remove the most uncertainty. Everything slow to work out (state sets,
//! answer probabilities, unseparable pairs) is done once in [`Key::new`], so ranking
//! and choosing a question stay fast enough to run on every tap in the browser.

use serde::Serialize;

use crate::answers::{Answer, Answers, Context};
use crate::checklist::{Character, CharacterState, Checklist, Taxon};
use crate::error::AnswerError;
use crate::likelihood::{self, StateSet, answer_likelihood, entropy_bits};
use crate::reasons;
use crate::separation::{UnseparablePair, overlapping_pairs};

/// Questions expected to gain less than this (in bits) are not worth asking.
pub const MIN_USEFUL_GAIN_BITS: f64 = 1e-6;

/// A key built over one checklist.
#[derive(Debug, Clone)]
pub struct Key {
    checklist: Checklist,
    /// `answer_probability[character][species * states + state]`.
    answer_probability: Vec<Vec<f64>>,
    /// `answer_entropy[character][species]`: entropy (bits) of a species' answer.
    answer_entropy: Vec<Vec<f64>>,
    unseparable: Vec<UnseparablePair>,
}

/// A species with its probability and the reasons behind it.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Candidate {
    /// Scientific name.
    pub scientific_name: String,
    /// Vernacular names, the preferred one first.
    pub common_names: Vec<String>,
    /// Posterior probability; the candidates of one ranking sum to 1.
    pub probability: f64,
    /// Plain-words reasons, for and against.
    pub reasons: Vec<Reason>,
}

/// One reason a species rose or fell.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct Reason {
    /// Which way it pushed.
    pub effect: Effect,
    /// Plain words in English, e.g. "6 gill slits" (what [`Said::english`] makes of `said`).
    pub text: String,
    /// What it says, as data, for a screen to put in its own language.
    pub said: crate::reasons::Said,
}

/// Which way a reason pushed a species.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "camelCase")]
pub enum Effect {
    /// Raised it.
    Supports,
    /// Lowered it.
    Against,
    /// Worth saying, but changed nothing.
    Neutral,
}

/// The question to ask next.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "camelCase")]
pub struct QuestionChoice {
    /// The character's name, to use in [`Answers`].
    pub character: String,
    /// The question to show.
    pub question: String,
    /// The states to offer (plus "not sure").
    pub states: Vec<CharacterState>,
    /// Expected reduction of the entropy over species, in bits.
    pub expected_gain_bits: f64,
}

/// An answer matched to the checklist: the character's position and the state's.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Given {
    Unanswered,
    NotSure,
    State(usize),
}

impl Key {
    /// Builds the key's tables for a checklist.
    pub fn new(checklist: &Checklist) -> Key {
        let characters = checklist.characters();
        // `allowed[species][character]`: the states each species can show.
        let allowed: Vec<Vec<StateSet>> = checklist
            .taxa()
            .iter()
            .map(|taxon| characters.iter().map(|c| allowed_states(taxon, c)).collect())
            .collect();
        let answer_probability: Vec<Vec<f64>> =
            (0..characters.len()).map(|c| answer_probability_table(&allowed, c, characters[c].states.len())).collect();
        let answer_entropy = answer_probability
            .iter()
            .zip(characters)
            .map(|(table, character)| {
                table.chunks(character.states.len()).map(|row| entropy_bits(row.iter().copied())).collect()
            })
            .collect();
        let unseparable = overlapping_pairs(&allowed)
            .into_iter()
            .map(|(i, j)| UnseparablePair {
                first: checklist.taxa()[i].scientific_name.clone(),
                second: checklist.taxa()[j].scientific_name.clone(),
            })
            .collect();
        Key { checklist: checklist.clone(), answer_probability, answer_entropy, unseparable }
    }

    /// The checklist the key was built over.
    pub fn checklist(&self) -> &Checklist {
        &self.checklist
    }

    /// Pairs of species that share a state on every character, so no answers can
    /// separate them (size and area may still). In checklist order.
    pub fn unseparable_pairs(&self) -> &[UnseparablePair] {
        &self.unseparable
    }

    /// The species the characters cannot separate from `scientific_name`.
    pub fn cannot_separate_from(&self, scientific_name: &str) -> Vec<&str> {
        self.unseparable
            .iter()
            .filter_map(|pair| {
                if pair.first == scientific_name {
                    Some(pair.second.as_str())
                } else if pair.second == scientific_name {
                    Some(pair.first.as_str())
                } else {
                    None
                }
            })
            .collect()
    }

    /// All species, most probable first, with their reasons. Ties keep checklist order.
    ///
    /// # Errors
    /// [`AnswerError`] when an answer names a character or state the checklist lacks.
    pub fn rank(&self, answers: &Answers, context: &Context) -> Result<Vec<Candidate>, AnswerError> {
        let given = self.match_answers(answers)?;
        let posterior = self.posterior(&given, context);
        let mut candidates: Vec<Candidate> = self
            .checklist
            .taxa()
            .iter()
            .zip(&posterior)
            .enumerate()
            .map(|(species, (taxon, &probability))| Candidate {
                scientific_name: taxon.scientific_name.clone(),
                common_names: taxon.common_names.clone(),
                probability,
                reasons: reasons::for_species(&self.checklist, species, &given, context),
            })
            .collect();
        candidates.sort_by(|a, b| b.probability.total_cmp(&a.probability));
        Ok(candidates)
    }

    /// The unanswered question with the largest expected information gain, or `None`
    /// when no question is left that would change the ranking.
    ///
    /// # Errors
    /// [`AnswerError`] when an answer names a character or state the checklist lacks.
    pub fn next_question(&self, answers: &Answers, context: &Context) -> Result<Option<QuestionChoice>, AnswerError> {
        let given = self.match_answers(answers)?;
        let posterior = self.posterior(&given, context);
        let best =
            self.gains(&given, &posterior).into_iter().fold(None, |best: Option<(usize, f64)>, (c, gain)| match best {
                Some((_, best_gain)) if best_gain >= gain => best,
                _ => Some((c, gain)),
            });
        Ok(best.filter(|(_, gain)| *gain > MIN_USEFUL_GAIN_BITS).map(|(c, gain)| self.question_choice(c, gain)))
    }

    /// Every unanswered question with its expected information gain, best first, so the
    /// app can offer another when the observer cannot see the part the best one asks about.
    ///
    /// # Errors
    /// [`AnswerError`] when an answer names a character or state the checklist lacks.
    pub fn questions_by_gain(&self, answers: &Answers, context: &Context) -> Result<Vec<QuestionChoice>, AnswerError> {
        let given = self.match_answers(answers)?;
        let posterior = self.posterior(&given, context);
        let mut gains = self.gains(&given, &posterior);
        gains.sort_by(|a, b| b.1.total_cmp(&a.1));
        Ok(gains.into_iter().map(|(c, gain)| self.question_choice(c, gain)).collect())
    }

    /// Posterior probability per species, in checklist order.
    ///
    /// Plain products are safe here: with at most 64 states an answer factor is at least
    /// 0.05 / 63 ≈ 8 × 10⁻⁴ and the prior at least 10⁻⁷, so up to about 90 answered
    /// characters stay above the smallest normal `f64` (checklists have one or two dozen)
    /// and the total is never zero.
    pub(crate) fn posterior(&self, given: &[Given], context: &Context) -> Vec<f64> {
        let mut weights: Vec<f64> = (0..self.checklist.taxa().len())
            .map(|species| self.prior(species, context) * self.answers_likelihood(species, given))
            .collect();
        let total: f64 = weights.iter().sum();
        for weight in &mut weights {
            *weight /= total;
        }
        weights
    }

    fn prior(&self, species: usize, context: &Context) -> f64 {
        let taxon = &self.checklist.taxa()[species];
        let area = context
            .area_code
            .as_deref()
            .filter(|code| self.checklist.areas().iter().any(|a| a.code == *code))
            .map_or(1.0, |code| likelihood::presence_weight(taxon, code));
        let nearby = context
            .nearby_confirmed
            .as_ref()
            .map_or(1.0, |counts| likelihood::nearby_weight(counts.get(&taxon.scientific_name).copied().unwrap_or(0)));
        let size = reasons::size_weight(taxon, context);
        area * nearby * size
    }

    fn answers_likelihood(&self, species: usize, given: &[Given]) -> f64 {
        given
            .iter()
            .enumerate()
            .filter_map(|(c, answer)| match answer {
                Given::State(state) => Some(self.probability_of_answer(c, species, *state)),
                Given::Unanswered | Given::NotSure => None,
            })
            .product()
    }

    fn probability_of_answer(&self, character: usize, species: usize, state: usize) -> f64 {
        let states = self.checklist.characters()[character].states.len();
        self.answer_probability[character][species * states + state]
    }

    /// Expected gain of each unanswered character: the mutual information between the
    /// species and the answer, I = H(answer) − Σ_species p(species) · H(answer | species),
    /// which equals the expected drop in entropy over species.
    fn gains(&self, given: &[Given], posterior: &[f64]) -> Vec<(usize, f64)> {
        given
            .iter()
            .enumerate()
            .filter(|(_, answer)| **answer == Given::Unanswered)
            .map(|(c, _)| (c, self.expected_gain_bits(c, posterior)))
            .collect()
    }

    fn expected_gain_bits(&self, character: usize, posterior: &[f64]) -> f64 {
        let states = self.checklist.characters()[character].states.len();
        let mut answer_marginal = vec![0.0; states];
        for (row, p) in self.answer_probability[character].chunks(states).zip(posterior) {
            for (marginal, q) in answer_marginal.iter_mut().zip(row) {
                *marginal += p * q;
            }
        }
        let conditional: f64 = posterior.iter().zip(&self.answer_entropy[character]).map(|(p, h)| p * h).sum();
        (entropy_bits(answer_marginal) - conditional).max(0.0)
    }

    fn question_choice(&self, character: usize, gain: f64) -> QuestionChoice {
        let Character { name, question, states } = &self.checklist.characters()[character];
        QuestionChoice {
            character: name.clone(),
            question: question.clone(),
            states: states.clone(),
            expected_gain_bits: gain,
        }
    }

    /// Splits `answers` into those this key's checklist knows and those it does not (a
    /// character or state it has dropped, say after the checklist was refreshed while
    /// the observer was answering), so a caller can go on with the first and tell the
    /// observer about the second instead of failing.
    pub fn usable_answers(&self, answers: &Answers) -> (Answers, Vec<AnswerError>) {
        let characters = self.checklist.characters();
        let mut usable = Answers::new();
        let mut dropped = Vec::new();
        for (name, answer) in answers.iter() {
            let known = match characters.iter().find(|c| c.name == name) {
                None => Err(AnswerError::UnknownCharacter(name.to_owned())),
                Some(character) => match answer {
                    Answer::NotSure => Ok(()),
                    Answer::State(state) => state_position(character, state).map(|_| ()),
                },
            };
            match known {
                Ok(()) => usable.set(name, answer.clone()),
                Err(error) => dropped.push(error),
            }
        }
        (usable, dropped)
    }

    /// Matches answers to the checklist's characters, in character order.
    pub(crate) fn match_answers(&self, answers: &Answers) -> Result<Vec<Given>, AnswerError> {
        let characters = self.checklist.characters();
        let mut given = vec![Given::Unanswered; characters.len()];
        for (name, answer) in answers.iter() {
            let position = characters
                .iter()
                .position(|c| c.name == name)
                .ok_or_else(|| AnswerError::UnknownCharacter(name.to_owned()))?;
            given[position] = match answer {
                Answer::NotSure => Given::NotSure,
                Answer::State(state) => Given::State(state_position(&characters[position], state)?),
            };
        }
        Ok(given)
    }
}

fn state_position(character: &Character, state: &str) -> Result<usize, AnswerError> {
    character
        .states
        .iter()
        .position(|s| s.name == state)
        .ok_or_else(|| AnswerError::UnknownState { character: character.name.clone(), state: state.to_owned() })
}

/// The states a taxon allows for a character; a character the taxon leaves out allows all.
pub(crate) fn allowed_states(taxon: &Taxon, character: &Character) -> StateSet {
    let all = StateSet::MAX >> (64 - character.states.len());
    taxon.characters.get(&character.name).map_or(all, |states| {
        character
            .states
            .iter()
            .enumerate()
            .filter(|(_, s)| states.contains(&s.name))
            .fold(0, |set, (i, _)| set | (1 << i))
    })
}

fn answer_probability_table(allowed: &[Vec<StateSet>], character: usize, states: usize) -> Vec<f64> {
    allowed
        .iter()
        .flat_map(|species| (0..states).map(move |s| answer_likelihood(species[character], states, s)))
        .collect()
}
