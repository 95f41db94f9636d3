//! What people look at, before it is given a format: a [`Drawing`] of circles, outlines, lines
//! and labels in millimetres, y up, each with the [`Pen`] it is drawn with. Result kinds that
//! have a picture (a train, a pair) build one from their finished results; the SVG sink lays it
//! out. It holds shapes only: where the shafts sit comes from the geometry core
//! ([`crate::geometry::layout`]), and tooth outlines, when they are drawn, from the geometry
//! core too.

/// A picture to scale, in mm with y up.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Drawing {
    /// What the picture shows, for its title.
    pub title: String,
    /// The shapes, back to front.
    pub shapes: Vec<Shape>,
    /// Lines of text under the picture (legend, caution).
    pub notes: Vec<String>,
}

/// How a shape is drawn: the meaning of a line, which the sink turns into a colour and a dash.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Pen {
    /// A gear's tooth outline (or its tip circle when the outline is not drawn).
    Outline,
    /// A gear in the back plane of a shared shaft.
    BackPlane,
    /// Pitch (reference) circle: dash and dot.
    Pitch,
    /// Base circle: thin.
    Base,
    /// Root circle: thin, dashed.
    Root,
    /// Shaft axes and the lines of centres.
    Centre,
    /// Dimension lines and their figures.
    Dimension,
    /// The line of action of a mesh.
    Action,
    /// A part of the machine that is not a gear (a shaft, a banjo slot).
    Machine,
}

/// One shape of a [`Drawing`].
#[derive(Debug, Clone, PartialEq)]
pub enum Shape {
    /// A circle.
    Circle {
        /// Centre, mm.
        centre: [f64; 2],
        /// Radius, mm.
        radius_mm: f64,
        /// How it is drawn.
        pen: Pen,
    },
    /// A polyline, closed when `closed`.
    Path {
        /// Points, mm.
        points: Vec<[f64; 2]>,
        /// Whether the last point joins the first.
        closed: bool,
        /// How it is drawn.
        pen: Pen,
    },
    /// A straight line.
    Line {
        /// Start, mm.
        from: [f64; 2],
        /// End, mm.
        to: [f64; 2],
        /// How it is drawn.
        pen: Pen,
    },
    /// A label whose middle is at `at`.
    Text {
        /// Where, mm.
        at: [f64; 2],
        /// The words.
        text: String,
        /// Letter height, mm.
        size_mm: f64,
    },
}

impl Drawing {
    /// The smallest box `[min_x, min_y, max_x, max_y]` holding every shape (labels by their
    /// anchor and an estimate of their width), or `None` for an empty drawing.
    pub fn bounds(&self) -> Option<[f64; 4]> {
        let mut b: Option<[f64; 4]> = None;
        let mut grow = |x: f64, y: f64| {
            let r = b.get_or_insert([x, y, x, y]);
            r[0] = r[0].min(x);
            r[1] = r[1].min(y);
            r[2] = r[2].max(x);
            r[3] = r[3].max(y);
        };
        for s in &self.shapes {
            match s {
                Shape::Circle { centre, radius_mm, .. } => {
                    grow(centre[0] - radius_mm, centre[1] - radius_mm);
                    grow(centre[0] + radius_mm, centre[1] + radius_mm);
                }
                Shape::Path { points, .. } => points.iter().for_each(|p| grow(p[0], p[1])),
                Shape::Line { from, to, .. } => {
                    grow(from[0], from[1]);
                    grow(to[0], to[1]);
                }
                Shape::Text { at, text, size_mm } => {
                    // About 0.6 of the letter height per character, centred.
                    let half = 0.3 * size_mm * text.chars().count() as f64;
                    grow(at[0] - half, at[1] - size_mm);
                    grow(at[0] + half, at[1] + size_mm);
                }
            }
        }
        b
    }
}
