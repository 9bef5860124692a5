//! Where the text labels of a diagram go: a greedy placement that never lets two labels
//! overlap, nor a label cover a marker, be crossed by a drawn line (an error bar, a curve)
//! or cross the plot's frame. Leader lines may cross drawn lines.
//!
//! Each label is tried at up to [`CANDIDATES`] positions around its anchor (eight directions
//! beside it, then sixteen at each of six farther distances, with a leader line back to the
//! marker that crosses no other label, marker or leader) and takes the first free one. Labels are placed in order of crowding (the label with the most
//! markers near it first, where it still has a choice), ties by their index, so the result
//! depends only on the input. A label with no free position is not placed: the caller says
//! so in its text output. Collisions are looked up in a grid of buckets, so the cost grows
//! with the number of labels times the few boxes near each candidate, not with the square of
//! the number of labels.
//!
//! Coordinates are pixels, `y` pointing down, as in SVG.

/// How wide text is drawn, as a fraction of the font size per character. DejaVu Sans (the
/// usual `sans-serif`) averages about 0.6 em per character of mixed-case text and 0.64 em per
/// digit (from memory); 0.62 keeps ordinary labels inside their estimated box.
pub const EM_PER_CHAR: f64 = 0.62;
/// The baseline of a line of text sits this far below the top of its box, in font sizes.
pub const ASCENT: f64 = 0.8;

/// The box a line of `text` at `font_px` takes, `(width, height)` in pixels, as every layout
/// of the diagrams estimates it (and the tests check it).
pub fn text_size(text: &str, font_px: f64) -> (f64, f64) {
    (text.chars().count() as f64 * EM_PER_CHAR * font_px, font_px)
}

/// An axis-aligned box, `x0 <= x1`, `y0 <= y1`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rect {
    pub x0: f64,
    pub y0: f64,
    pub x1: f64,
    pub y1: f64,
}

impl Rect {
    pub fn new(x0: f64, y0: f64, x1: f64, y1: f64) -> Rect {
        Rect {
            x0: x0.min(x1),
            y0: y0.min(y1),
            x1: x0.max(x1),
            y1: y0.max(y1),
        }
    }

    /// A square of half-side `r` around a point (a marker's box).
    pub fn around(x: f64, y: f64, r: f64) -> Rect {
        Rect::new(x - r, y - r, x + r, y + r)
    }

    /// Whether the two boxes share more than an edge.
    pub fn overlaps(&self, o: &Rect) -> bool {
        self.x0 < o.x1 && o.x0 < self.x1 && self.y0 < o.y1 && o.y0 < self.y1
    }

    pub fn inside(&self, o: &Rect) -> bool {
        self.x0 >= o.x0 && self.x1 <= o.x1 && self.y0 >= o.y0 && self.y1 <= o.y1
    }

    fn grown(&self, by: f64) -> Rect {
        Rect::new(self.x0 - by, self.y0 - by, self.x1 + by, self.y1 + by)
    }

    /// The point of the box nearest to `(x, y)`.
    pub fn nearest(&self, x: f64, y: f64) -> (f64, f64) {
        (x.clamp(self.x0, self.x1), y.clamp(self.y0, self.y1))
    }

    /// Whether the segment from `a` to `b` passes through the box (Liang–Barsky clipping).
    fn crossed_by(&self, a: (f64, f64), b: (f64, f64)) -> bool {
        let (dx, dy) = (b.0 - a.0, b.1 - a.1);
        let (mut t0, mut t1) = (0.0f64, 1.0f64);
        for (p, q) in [
            (-dx, a.0 - self.x0),
            (dx, self.x1 - a.0),
            (-dy, a.1 - self.y0),
            (dy, self.y1 - a.1),
        ] {
            if p == 0.0 {
                if q < 0.0 {
                    return false;
                }
            } else {
                let t = q / p;
                if p < 0.0 {
                    t0 = t0.max(t);
                } else {
                    t1 = t1.min(t);
                }
            }
        }
        t0 < t1
    }
}

/// One label to place: the marker it names and the size of its text.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Request {
    /// The marker's centre.
    pub x: f64,
    pub y: f64,
    /// Half the marker's size: the label keeps clear of it.
    pub radius: f64,
    pub width: f64,
    pub height: f64,
}

/// Where a label went.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placed {
    pub rect: Rect,
    /// From the marker's edge to the label's nearest point, when the label sits away from
    /// its marker.
    pub leader: Option<Segment>,
}

/// Gaps between a marker's edge and its label, in pixels: the first is "beside it", the
/// others need a leader line.
const RINGS: [f64; 7] = [3.0, 14.0, 28.0, 46.0, 70.0, 100.0, 140.0];
/// Directions tried at each distance, as angles in degrees (0 is right, negative is up), in
/// order of preference: right, then up and down from it, then left, then straight above and
/// below. Beside the marker only the eight main directions are tried.
const DIRECTIONS: [f64; 16] = [
    0.0, -22.5, 22.5, -45.0, 45.0, 180.0, -157.5, 157.5, -135.0, 135.0, -67.5, 67.5, -112.5, 112.5,
    -90.0, 90.0,
];
/// How many positions a label is tried at.
pub const CANDIDATES: usize = 8 + (RINGS.len() - 1) * DIRECTIONS.len();
/// Space kept free around every label, in pixels.
const PAD: f64 = 1.5;
/// The side of a bucket of the collision grid, in pixels.
const CELL: f64 = 48.0;

/// A line from one point to another, in pixels.
pub type Segment = ((f64, f64), (f64, f64));

/// A grid of buckets over the frame: each box (with the leader line it bounds, if it is
/// one) is listed in every bucket it touches.
struct Grid {
    frame: Rect,
    cols: usize,
    rows: usize,
    cells: Vec<Vec<usize>>,
    boxes: Vec<(Rect, Option<Segment>)>,
}

impl Grid {
    fn new(frame: Rect) -> Grid {
        // A frame too large for its buckets to be counted cheaply gets coarser buckets.
        let side = |len: f64| ((len / CELL).ceil().clamp(1.0, 512.0)) as usize;
        let (cols, rows) = (side(frame.x1 - frame.x0), side(frame.y1 - frame.y0));
        Grid {
            frame,
            cols,
            rows,
            cells: vec![Vec::new(); cols * rows],
            boxes: Vec::new(),
        }
    }

    /// The bucket range a box touches (clamped to the frame).
    fn span(&self, r: &Rect) -> (usize, usize, usize, usize) {
        let w = (self.frame.x1 - self.frame.x0).max(1.0) / self.cols as f64;
        let h = (self.frame.y1 - self.frame.y0).max(1.0) / self.rows as f64;
        let col = |x: f64| (((x - self.frame.x0) / w).floor().max(0.0) as usize).min(self.cols - 1);
        let row = |y: f64| (((y - self.frame.y0) / h).floor().max(0.0) as usize).min(self.rows - 1);
        (col(r.x0), col(r.x1), row(r.y0), row(r.y1))
    }

    fn insert(&mut self, r: Rect, segment: Option<Segment>) {
        let id = self.boxes.len();
        self.boxes.push((r, segment));
        let (c0, c1, r0, r1) = self.span(&r);
        for row in r0..=r1 {
            for col in c0..=c1 {
                if let Some(cell) = self.cells.get_mut(row * self.cols + col) {
                    cell.push(id);
                }
            }
        }
    }

    /// The boxes listed in the buckets `r` touches (a box may come more than once).
    fn near(&self, r: &Rect) -> impl Iterator<Item = &(Rect, Option<Segment>)> {
        let (c0, c1, r0, r1) = self.span(r);
        (r0..=r1)
            .flat_map(move |row| (c0..=c1).map(move |col| row * self.cols + col))
            .filter_map(|i| self.cells.get(i))
            .flatten()
            .filter_map(|&id| self.boxes.get(id))
    }

    fn hits(&self, r: &Rect) -> bool {
        self.near(r).any(|(b, _)| b.overlaps(r))
    }

    /// Whether a segment listed here passes through `r`.
    fn crosses(&self, r: &Rect) -> bool {
        self.near(r)
            .any(|(b, seg)| b.overlaps(r) && seg.is_some_and(|(a, c)| r.crossed_by(a, c)))
    }
}

/// The box of a label at distance `gap` from the marker's edge in direction `degrees`:
/// the side of the box facing the marker is that far away.
fn candidate(req: &Request, gap: f64, degrees: f64) -> Rect {
    let (w, h) = (req.width, req.height);
    let (uy, ux) = degrees.to_radians().sin_cos();
    let d = req.radius + gap;
    let (px, py) = (req.x + d * ux, req.y + d * uy);
    // Beyond about 17 deg from an axis, the box is put on that side of the point.
    let x0 = if ux > 0.3 {
        px
    } else if ux < -0.3 {
        px - w
    } else {
        px - w / 2.0
    };
    let y0 = if uy > 0.3 {
        py
    } else if uy < -0.3 {
        py - h
    } else {
        py - h / 2.0
    };
    Rect::new(x0, y0, x0 + w, y0 + h)
}

/// Whether two segments cross (touching ends do not count).
fn segments_cross(a: (f64, f64), b: (f64, f64), c: (f64, f64), d: (f64, f64)) -> bool {
    let side = |p: (f64, f64), q: (f64, f64), r: (f64, f64)| {
        (q.0 - p.0) * (r.1 - p.1) - (q.1 - p.1) * (r.0 - p.0)
    };
    let (d1, d2) = (side(c, d, a), side(c, d, b));
    let (d3, d4) = (side(a, b, c), side(a, b, d));
    d1 * d2 < 0.0 && d3 * d4 < 0.0
}

/// Place `labels` inside `frame`, clear of `obstacles` (markers, other drawn boxes), of
/// the drawn `lines` (segments: error bars, the pieces of a curve) and of each other; `None`
/// for a label with no free position. `fixed` labels are placed first, in their order,
/// before the crowding order applies to the rest.
pub fn place(
    frame: Rect,
    obstacles: &[Rect],
    lines: &[Segment],
    labels: &[Request],
    fixed: usize,
) -> Vec<Option<Placed>> {
    let mut grid = Grid::new(frame);
    for o in obstacles {
        grid.insert(*o, None);
    }
    let mut drawn = Grid::new(frame);
    for &(a, b) in lines {
        drawn.insert(Rect::new(a.0, a.1, b.0, b.1), Some((a, b)));
    }
    // Crowding: how many obstacles lie within a few label heights of the anchor.
    let crowding: Vec<usize> = labels
        .iter()
        .map(|l| {
            let near = Rect::around(l.x, l.y, 40.0);
            grid.near(&near).filter(|(b, _)| b.overlaps(&near)).count()
        })
        .collect();
    let mut order: Vec<usize> = (fixed.min(labels.len())..labels.len()).collect();
    order.sort_by_key(|&i| (std::cmp::Reverse(crowding.get(i).copied().unwrap_or(0)), i));
    let order = (0..fixed.min(labels.len())).chain(order);
    let mut out = vec![None; labels.len()];
    // Leader lines drawn so far.
    let mut leaders = Grid::new(frame);
    for i in order {
        let Some(req) = labels.get(i) else { continue };
        let tries = RINGS.iter().enumerate().flat_map(|(ring, &gap)| {
            let dirs: &[f64] = if ring == 0 {
                &[0.0, -45.0, 45.0, 180.0, -135.0, 135.0, -90.0, 90.0]
            } else {
                &DIRECTIONS
            };
            dirs.iter().map(move |&dir| (ring, gap, dir))
        });
        let spot = tries.take(CANDIDATES).find_map(|(ring, gap, dir)| {
            let r = candidate(req, gap, dir);
            let padded = r.grown(PAD);
            if !padded.inside(&frame) || grid.hits(&padded) || drawn.crosses(&padded) {
                return None;
            }
            if ring == 0 {
                return Some(Placed {
                    rect: r,
                    leader: None,
                });
            }
            let end = r.nearest(req.x, req.y);
            let len = ((end.0 - req.x).powi(2) + (end.1 - req.y).powi(2)).sqrt();
            let f = if len > 0.0 { req.radius / len } else { 0.0 };
            let start = (req.x + (end.0 - req.x) * f, req.y + (end.1 - req.y) * f);
            // A leader passes no other label or marker and crosses no other leader.
            let own = |b: &Rect| b.x0 <= req.x && req.x <= b.x1 && b.y0 <= req.y && req.y <= b.y1;
            let span = Rect::new(start.0, start.1, end.0, end.1);
            let blocked = grid
                .near(&span)
                .any(|(b, _)| !own(b) && b.crossed_by(start, end))
                || leaders
                    .near(&span)
                    .any(|(_, seg)| seg.is_some_and(|(c, d)| segments_cross(start, end, c, d)));
            (!blocked).then_some(Placed {
                rect: r,
                leader: Some((start, end)),
            })
        });
        if let Some(p) = spot {
            grid.insert(p.rect.grown(PAD), None);
            if let Some((a, b)) = p.leader {
                leaders.insert(Rect::new(a.0, a.1, b.0, b.1), Some((a, b)));
            }
            if let Some(slot) = out.get_mut(i) {
                *slot = Some(p);
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn req(x: f64, y: f64, chars: usize) -> Request {
        let (width, height) = text_size(&"x".repeat(chars), 13.0);
        Request {
            x,
            y,
            radius: 5.0,
            width,
            height,
        }
    }

    fn frame() -> Rect {
        Rect::new(0.0, 0.0, 800.0, 600.0)
    }

    #[test]
    fn a_lone_label_sits_right_of_its_marker_without_a_leader() {
        let out = place(frame(), &[], &[], &[req(100.0, 100.0, 7)], 0);
        let p = out[0].unwrap();
        assert!(p.rect.x0 > 105.0 && p.rect.x0 < 110.0, "{p:?}");
        assert!(p.rect.y0 < 100.0 && p.rect.y1 > 100.0);
        assert!(p.leader.is_none());
    }

    #[test]
    fn labels_near_the_right_edge_go_left_and_stay_inside() {
        let out = place(frame(), &[], &[], &[req(790.0, 300.0, 10)], 0);
        let p = out[0].unwrap();
        assert!(p.rect.x1 < 790.0 && p.rect.inside(&frame()), "{p:?}");
    }

    #[test]
    fn crowded_labels_never_overlap_each_other_or_markers_and_some_get_leaders() {
        // Thirty markers on a short diagonal: more than fits beside them.
        let labels: Vec<Request> = (0..30)
            .map(|i| req(300.0 + 4.0 * i as f64, 300.0 - 3.0 * i as f64, 9))
            .collect();
        let markers: Vec<Rect> = labels.iter().map(|l| Rect::around(l.x, l.y, 5.0)).collect();
        let out = place(frame(), &markers, &[], &labels, 0);
        let rects: Vec<Rect> = out.iter().flatten().map(|p| p.rect).collect();
        for (i, a) in rects.iter().enumerate() {
            assert!(a.inside(&frame()));
            for b in rects.iter().skip(i + 1) {
                assert!(!a.overlaps(b), "{a:?} {b:?}");
            }
            for m in &markers {
                assert!(!a.overlaps(m), "{a:?} covers {m:?}");
            }
        }
        assert!(out.iter().flatten().any(|p| p.leader.is_some()));
        assert!(rects.len() >= 12, "only {} placed", rects.len());
    }

    /// A planet's own error bars and a curve through the spot beside it: the label goes
    /// where none of them crosses it.
    #[test]
    fn drawn_lines_never_cross_a_label() {
        let bars = [
            ((40.0, 100.0), (260.0, 100.0)),
            ((100.0, 40.0), (100.0, 160.0)),
            ((60.0, 60.0), (300.0, 130.0)),
        ];
        let labels = [req(100.0, 100.0, 12)];
        let out = place(frame(), &[], &bars, &labels, 0);
        let p = out[0].expect("placed");
        for (a, b) in bars {
            assert!(
                !p.rect.grown(PAD).crossed_by(a, b),
                "{p:?} crossed by {a:?}-{b:?}"
            );
        }
        // Without the lines it would sit right of the marker, across the horizontal bar.
        let free = place(frame(), &[], &[], &labels, 0)[0].expect("placed");
        assert!(free.rect.crossed_by(bars[0].0, bars[0].1), "{free:?}");
    }

    #[test]
    fn a_label_with_no_room_is_not_placed() {
        let tiny = Rect::new(0.0, 0.0, 40.0, 40.0);
        let out = place(tiny, &[], &[], &[req(20.0, 20.0, 30)], 0);
        assert_eq!(out, vec![None]);
    }

    #[test]
    fn fixed_labels_are_placed_first_and_the_result_is_deterministic() {
        let labels = vec![req(200.0, 200.0, 8), req(204.0, 200.0, 8)];
        let a = place(frame(), &[], &[], &labels, 1);
        assert_eq!(a, place(frame(), &[], &[], &labels, 1));
        // The fixed one gets its first choice (right of it, no leader).
        assert!(a[0].unwrap().leader.is_none());
        assert!(a[0].unwrap().rect.x0 > 200.0);
    }

    #[test]
    fn leader_segments_are_clipped_against_boxes() {
        let r = Rect::new(10.0, 10.0, 20.0, 20.0);
        assert!(r.crossed_by((0.0, 15.0), (30.0, 15.0)));
        assert!(!r.crossed_by((0.0, 0.0), (30.0, 5.0)));
        assert!(!r.crossed_by((0.0, 15.0), (5.0, 15.0)));
    }
}
