//! The tooth forms a mesh may be cut to: involute by a basic rack, or the cycloidal
//! (horological) wheel-and-pinion form clocks are cut to. Owns only the names; the geometry of
//! each is [`super::working`]'s and [`super::cycloidal`]'s.

/// The form the teeth of every stage are cut to.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum ToothForm {
    /// Involute teeth by a basic rack, shifted where a centre distance needs it.
    #[default]
    Involute,
    /// Cycloidal (horological) wheel-and-pinion teeth as clocks are cut, with no shift, at the
    /// centre distance m·(z1 + z2)/2 ([`crate::geometry::cycloidal`]).
    Cycloidal,
}

impl ToothForm {
    /// `involute` or `cycloidal`.
    pub fn as_str(self) -> &'static str {
        match self {
            ToothForm::Involute => "involute",
            ToothForm::Cycloidal => "cycloidal",
        }
    }
}
