//! Why a trend could not be computed, each reason in words an assessor can act on.

use thiserror::Error;

/// Why a trend could not be computed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum TrendError {
    /// The design has no columns.
    #[error("the design matrix needs at least one column")]
    NoColumns,
    /// A design row has the wrong number of values.
    #[error("design row {row} has {got} values but there are {expected} columns")]
    RowLength {
        /// Zero-based row.
        row: usize,
        /// Number of columns.
        expected: usize,
        /// Values in the row.
        got: usize,
    },
    /// Inputs of one observation each do not have one value per observation.
    #[error("{what} has {got} values but there are {expected} observations")]
    LengthMismatch {
        /// Which input.
        what: &'static str,
        /// Number of observations.
        expected: usize,
        /// Values given.
        got: usize,
    },
    /// A value is infinite or not a number.
    #[error("{what} in row {row}{} is not a finite number", column.map(|c| format!(", column {c}")).unwrap_or_default())]
    NotFinite {
        /// Which input.
        what: &'static str,
        /// Zero-based row.
        row: usize,
        /// Zero-based column, for design values.
        column: Option<usize>,
    },
    /// A count is negative.
    #[error("count must be zero or more, got {value} in row {row}")]
    NegativeCount {
        /// Zero-based row.
        row: usize,
        /// The count given.
        value: f64,
    },
    /// More coefficients than observations.
    #[error("{rows} observations cannot fit {columns} coefficients")]
    TooFewObservations {
        /// Observations.
        rows: usize,
        /// Coefficients.
        columns: usize,
    },
    /// Every count is zero, so the rate is zero and its logarithm has no finite fit.
    #[error("every count is zero, so no rate or trend can be fitted")]
    AllCountsZero,
    /// A design column is a linear combination of earlier columns.
    #[error("design column '{column}' is a linear combination of the columns before it")]
    DependentColumns {
        /// The dependent column's name.
        column: String,
    },
    /// IRLS did not settle.
    #[error("the model did not converge after {iterations} iterations")]
    NotConverged {
        /// Iterations run.
        iterations: usize,
    },
    /// Times of a series must increase.
    #[error("times must increase strictly, but value {row} is not later than the one before")]
    TimesNotIncreasing {
        /// Zero-based index of the offending time.
        row: usize,
    },
    /// Effort is zero, negative or not a number.
    #[error("effort must be positive in year {year}, got {effort}")]
    EffortNotPositive {
        /// The year.
        year: i32,
        /// The effort given.
        effort: f64,
    },
    /// The same year appears twice.
    #[error("year {0} appears more than once; give one total per year")]
    DuplicateYear(i32),
    /// Too few years to fit and check a trend.
    #[error("a trend needs at least 3 years with effort, got {0}")]
    TooFewYears(usize),
    /// Too few years with effort inside the assessment window.
    #[error(
        "the assessment window {first}–{last} holds {years} years with effort; a trend needs at least 3 \
         (the years before the window are not used, as criterion A looks at the most recent window)"
    )]
    TooFewYearsInWindow {
        /// First year of the window.
        first: i32,
        /// Last year of the window.
        last: i32,
        /// Years with effort in it.
        years: usize,
    },
    /// Every animal was found in a single year, so the fitted rate would rise or fall without limit.
    #[error(
        "all {animals} animals in {first}–{last} were found in one year ({year}); a trend needs finds in at least \
         two different years, because with finds in one year only the fitted rate rises or falls without \
         limit towards that year (separation) and no change can be estimated"
    )]
    FindsInOneYear {
        /// The one year with finds.
        year: i32,
        /// Animals found that year.
        animals: u64,
        /// First year fitted.
        first: i32,
        /// Last year fitted.
        last: i32,
    },
    /// The generation length is not a positive number of years.
    #[error("generation length must be a positive number of years, got {0}")]
    InvalidGenerationLength(f64),
}
