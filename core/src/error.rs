//! Typed errors. Every error names the field (or engine item) it is about, says what
//! was wrong and, where there is one, the valid range. Messages are lowercase
//! fragments that read well after the field label ("pressure: must be at least 0 psi").

use std::fmt;

/// What was wrong with one input field.
#[derive(Clone, Debug, PartialEq)]
pub enum FieldErrorKind {
    /// A required field was empty or absent.
    Missing,
    /// The text is not a number (optionally followed by a unit). `bounds`: the
    /// field's valid range, where it has one, so the message says what to type.
    NotANumber { text: String, bounds: Option<Bounds> },
    /// NaN or an infinity was typed, or a number too large for a 64-bit float
    /// (`1e400`). `bounds` as for [`FieldErrorKind::NotANumber`].
    NotFinite { bounds: Option<Bounds> },
    /// The unit is not known at all; `suggestions` are the nearest units of the
    /// field's kind (may be empty), `expected` every unit of that kind.
    UnknownUnit {
        unit: String,
        suggestions: Vec<String>,
        expected: String,
    },
    /// A known spelling that this field refuses, and why (`psia` in a gauge field).
    RefusedUnit { unit: String, reason: String },
    /// The unit is known but measures another kind of quantity (`5 psi` for a length).
    WrongKind {
        unit: String,
        unit_kind: &'static str,
        expected: String,
    },
    /// `1,500`: a comma that may be a decimal comma or a thousands separator.
    AmbiguousComma { text: String },
    /// The value is outside the field's valid range.
    OutOfRange(Bounds),
    /// A non-zero value below the smallest meaningful magnitude of its kind
    /// (`catalog::smallest_meaningful`): 5e-324 mm is not a diameter.
    BelowSmallest {
        /// The smallest meaningful magnitude, in the field's unit.
        smallest: String,
        /// Zero, in the field's unit.
        zero: String,
        /// The field's upper limit, in its unit (empty when it has none).
        max: String,
        /// Whether 0 itself is a valid value of the field.
        zero_allowed: bool,
    },
    /// A choice field got a value that is not one of its options.
    UnknownChoice { allowed: Vec<String> },
    /// The value is valid alone but not together with other inputs.
    Inconsistent { reason: String },
    /// The text is too long to be an input (a guard against pasted junk).
    TooLong { max_chars: usize },
}

/// A field's valid range as a message states it: the bounds formatted in the unit
/// the field is read in, without trailing zeros (`at least 0.1° and at most 180°`).
#[derive(Clone, Debug, PartialEq)]
pub struct Bounds {
    pub min: String,
    pub max: String,
    /// Whether `min` itself is valid (`at least`) or not (`greater than`).
    pub min_inclusive: bool,
}

impl fmt::Display for Bounds {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let op = if self.min_inclusive { "at least" } else { "greater than" };
        write!(f, "{op} {} and at most {}", self.min, self.max)
    }
}

impl FieldErrorKind {
    /// `text` is not a number; the field's range is added where the field is known.
    pub fn not_a_number(text: impl Into<String>) -> FieldErrorKind {
        FieldErrorKind::NotANumber {
            text: text.into(),
            bounds: None,
        }
    }

    /// The typed number is NaN, an infinity or beyond a 64-bit float.
    pub const NOT_FINITE: FieldErrorKind = FieldErrorKind::NotFinite { bounds: None };

    /// The same error, stating the field's valid range where the error is about what
    /// to type (not a number, not finite); every other error is returned unchanged.
    pub fn with_bounds(self, range: Bounds) -> FieldErrorKind {
        match self {
            FieldErrorKind::NotANumber { text, .. } => FieldErrorKind::NotANumber {
                text,
                bounds: Some(range),
            },
            FieldErrorKind::NotFinite { .. } => FieldErrorKind::NotFinite { bounds: Some(range) },
            other => other,
        }
    }
}

/// An error attached to one input field.
#[derive(Clone, Debug, PartialEq)]
pub struct FieldError {
    /// Key of the field (as in the URL and the calculator description).
    pub field: String,
    pub kind: FieldErrorKind,
}

impl FieldError {
    pub fn new(field: impl Into<String>, kind: FieldErrorKind) -> FieldError {
        FieldError {
            field: field.into(),
            kind,
        }
    }
    /// Shorthand for [`FieldErrorKind::Inconsistent`].
    pub fn inconsistent(field: impl Into<String>, reason: impl Into<String>) -> FieldError {
        FieldError::new(field, FieldErrorKind::Inconsistent { reason: reason.into() })
    }
}

impl fmt::Display for FieldErrorKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            FieldErrorKind::Missing => write!(f, "a value is required"),
            FieldErrorKind::NotANumber { text, bounds } => {
                write!(f, "'{}' is not a number; type a number", shorten(text))?;
                match bounds {
                    Some(bounds) => write!(f, " {bounds} (a unit after the number is optional)"),
                    None => write!(f, ", optionally followed by its unit"),
                }
            }
            FieldErrorKind::NotFinite { bounds } => {
                write!(f, "must be a finite number")?;
                if let Some(bounds) = bounds {
                    write!(f, " {bounds}")?;
                }
                write!(f, " (NaN, infinity and numbers beyond 1e308 are not accepted)")
            }
            FieldErrorKind::UnknownUnit {
                unit,
                suggestions,
                expected,
            } => {
                if suggestions.is_empty() {
                    write!(f, "unknown unit '{}'; use one of: {expected}", shorten(unit))
                } else {
                    write!(
                        f,
                        "unknown unit '{}'; did you mean {}? (units here: {expected})",
                        shorten(unit),
                        suggestions.join(" or ")
                    )
                }
            }
            FieldErrorKind::RefusedUnit { unit, reason } => {
                write!(f, "'{}' is not accepted here: {reason}", shorten(unit))
            }
            FieldErrorKind::WrongKind {
                unit,
                unit_kind,
                expected,
            } => {
                write!(
                    f,
                    "'{}' is a unit of {unit_kind}, not of this field; use one of: {expected}",
                    shorten(unit)
                )
            }
            FieldErrorKind::AmbiguousComma { text } => write!(
                f,
                "'{}' is ambiguous: the comma may be a decimal comma or a thousands separator; write it \
                        without the comma or with a decimal point",
                shorten(text)
            ),
            FieldErrorKind::OutOfRange(bounds) => write!(f, "must be {bounds}"),
            FieldErrorKind::BelowSmallest {
                smallest,
                zero,
                max,
                zero_allowed,
            } => {
                let upper = if max.is_empty() {
                    String::new()
                } else {
                    format!(" and at most {max}")
                };
                if *zero_allowed {
                    write!(
                        f,
                        "is below {smallest}, the smallest meaningful value: type {zero}, or at least \
                                {smallest}{upper}"
                    )
                } else {
                    write!(
                        f,
                        "must be greater than {zero}: at least {smallest} (the smallest meaningful \
                                value){upper}"
                    )
                }
            }
            FieldErrorKind::UnknownChoice { allowed } => write!(f, "must be one of: {}", allowed.join(", ")),
            FieldErrorKind::Inconsistent { reason } => write!(f, "{reason}"),
            FieldErrorKind::TooLong { max_chars } => write!(f, "is too long (at most {max_chars} characters)"),
        }
    }
}

impl fmt::Display for FieldError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.field, self.kind)
    }
}

impl std::error::Error for FieldError {}

/// Shortens user text echoed back in a message, so a pasted 100 kB string does not
/// come back whole.
fn shorten(text: &str) -> String {
    const MAX: usize = 40;
    if text.chars().count() <= MAX {
        text.to_string()
    } else {
        let head: String = text.chars().take(MAX).collect();
        format!("{head}…")
    }
}

/// Why a calculator could not be solved.
#[derive(Clone, Debug, PartialEq)]
pub enum SolveError {
    /// No calculator has this key.
    UnknownCalculator { key: String },
    /// One or more fields are invalid; every field error found is listed.
    Fields(Vec<FieldError>),
}

/// Every field error of one request, so that reading typed inputs can use `?` on
/// each field (`FieldError` converts) and still report all of them where it
/// collects them.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct FieldErrors(pub Vec<FieldError>);

impl FieldErrors {
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
    pub fn push(&mut self, e: FieldError) {
        self.0.push(e);
    }
    /// `Ok(value)` when no error was collected.
    pub fn or_ok<T>(self, value: T) -> Result<T, FieldErrors> {
        if self.0.is_empty() {
            Ok(value)
        } else {
            Err(self)
        }
    }
}

impl From<FieldError> for FieldErrors {
    fn from(e: FieldError) -> FieldErrors {
        FieldErrors(vec![e])
    }
}

impl From<Vec<FieldError>> for FieldErrors {
    fn from(e: Vec<FieldError>) -> FieldErrors {
        FieldErrors(e)
    }
}

impl From<FieldErrors> for Vec<FieldError> {
    fn from(e: FieldErrors) -> Vec<FieldError> {
        e.0
    }
}

impl From<FieldErrors> for SolveError {
    fn from(e: FieldErrors) -> SolveError {
        SolveError::Fields(e.0)
    }
}

impl fmt::Display for SolveError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            SolveError::UnknownCalculator { key } => write!(f, "no calculator is called '{}'", shorten(key)),
            SolveError::Fields(errors) => {
                let parts: Vec<String> = errors.iter().map(|e| e.to_string()).collect();
                write!(f, "{}", parts.join("; "))
            }
        }
    }
}

impl std::error::Error for SolveError {}

impl From<FieldError> for SolveError {
    fn from(e: FieldError) -> SolveError {
        SolveError::Fields(vec![e])
    }
}

impl From<Vec<FieldError>> for SolveError {
    fn from(e: Vec<FieldError>) -> SolveError {
        SolveError::Fields(e)
    }
}
