//! A small SVG writer for the diagrams, and the frame, ticks and wrapped text they share.
//! Every line of text is written with its top at a known place and its size estimated by
//! [`syzygy::plots::labels::text_size`], the estimate the label layout and the tests use.

use std::fmt::Write as _;
use syzygy::plots::labels::{text_size, Rect, ASCENT};
use syzygy::plots::ticks::Tick;

pub const FONT: &str = "DejaVu Sans, Verdana, sans-serif";
pub const INK: &str = "#1a1a1a";
pub const GRID: &str = "#e4e4e4";
pub const MUTED: &str = "#5c5c5c";
pub const CAPTION_FONT: f64 = 13.0;
/// From one caption line to the next, in pixels.
pub const CAPTION_STEP: f64 = 17.0;

#[derive(Clone, Copy)]
pub enum Anchor {
    Start,
    Middle,
    End,
}

/// How a marker is drawn; the shape and colour tell a system apart.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Shape {
    Circle,
    Square,
    TriangleUp,
    Diamond,
    TriangleDown,
}

impl Shape {
    pub const ALL: [Shape; 5] = [
        Shape::Circle,
        Shape::Square,
        Shape::TriangleUp,
        Shape::Diamond,
        Shape::TriangleDown,
    ];

    pub fn name(self) -> &'static str {
        match self {
            Shape::Circle => "circle",
            Shape::Square => "square",
            Shape::TriangleUp => "triangle",
            Shape::Diamond => "diamond",
            Shape::TriangleDown => "inverted triangle",
        }
    }
}

fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            c if c.is_control() => out.push(' '),
            c => out.push(c),
        }
    }
    out
}

/// A coordinate as written: two decimals, enough for any screen.
fn n(v: f64) -> String {
    let s = format!("{v:.2}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".to_string()
    } else {
        s.to_string()
    }
}

pub struct Svg {
    out: String,
}

impl Svg {
    pub fn new() -> Svg {
        Svg { out: String::new() }
    }

    /// The document: a white page of `width` × `height` with what was drawn on it.
    pub fn finish(self, width: f64, height: f64) -> String {
        let mut doc = String::with_capacity(self.out.len() + 400);
        let _ = write!(
            doc,
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" font-family=\"{FONT}\">\n<rect x=\"0\" y=\"0\" width=\"{w}\" height=\"{h}\" fill=\"#ffffff\"/>\n",
            w = n(width),
            h = n(height)
        );
        doc.push_str(&self.out);
        doc.push_str("</svg>\n");
        doc
    }

    /// One line of text whose box starts at `top`; returns the box.
    #[allow(clippy::too_many_arguments)]
    pub fn text(
        &mut self,
        x: f64,
        top: f64,
        size: f64,
        anchor: Anchor,
        text: &str,
        fill: &str,
        bold: bool,
        halo: bool,
    ) -> Rect {
        let (w, h) = text_size(text, size);
        let (a, x0) = match anchor {
            Anchor::Start => ("start", x),
            Anchor::Middle => ("middle", x - w / 2.0),
            Anchor::End => ("end", x - w),
        };
        let weight = if bold { " font-weight=\"bold\"" } else { "" };
        // The halo is a white copy drawn first, under the text, rather than the text's own
        // stroke with `paint-order`: renderers that ignore `paint-order` (some SVG-to-PNG
        // converters) drew the white stroke over the text and hid it.
        let (x, y, size, text) = (n(x), n(top + ASCENT * size), n(size), escape(text));
        if halo {
            let _ = writeln!(
                self.out,
                "<text x=\"{x}\" y=\"{y}\" font-size=\"{size}\" text-anchor=\"{a}\" fill=\"#ffffff\" stroke=\"#ffffff\" stroke-width=\"3\" stroke-linejoin=\"round\"{weight} aria-hidden=\"true\">{text}</text>"
            );
        }
        let _ = writeln!(
            self.out,
            "<text x=\"{x}\" y=\"{y}\" font-size=\"{size}\" text-anchor=\"{a}\" fill=\"{fill}\"{weight}>{text}</text>"
        );
        Rect::new(x0, top, x0 + w, top + h)
    }

    /// Lines of a caption, in muted ink, from `top` down.
    pub fn caption(&mut self, lines: &[String], top: f64) {
        for (i, l) in lines.iter().enumerate() {
            let top = top + CAPTION_STEP * i as f64;
            self.text(
                20.0,
                top,
                CAPTION_FONT,
                Anchor::Start,
                l,
                MUTED,
                false,
                false,
            );
        }
    }

    /// A line of text turned a quarter turn anticlockwise, centred on `(x, y)` (the middle
    /// of its box).
    pub fn text_up(&mut self, x: f64, y: f64, size: f64, text: &str) {
        let base = x + (ASCENT - 0.5) * size;
        let _ = writeln!(
            self.out,
            "<text x=\"{bx}\" y=\"{by}\" font-size=\"{}\" text-anchor=\"middle\" fill=\"{INK}\" transform=\"rotate(-90 {bx} {by})\">{}</text>",
            n(size),
            escape(text),
            bx = n(base),
            by = n(y),
        );
    }

    pub fn polyline(
        &mut self,
        pts: &[(f64, f64)],
        stroke: &str,
        width: f64,
        dash: &str,
        opacity: f64,
    ) {
        if pts.len() < 2 {
            return;
        }
        let p: Vec<String> = pts
            .iter()
            .map(|(x, y)| format!("{},{}", n(*x), n(*y)))
            .collect();
        let dash = if dash.is_empty() {
            String::new()
        } else {
            format!(" stroke-dasharray=\"{dash}\"")
        };
        let opacity = if opacity < 1.0 {
            format!(" stroke-opacity=\"{}\"", n(opacity))
        } else {
            String::new()
        };
        let _ = writeln!(
            self.out,
            "<polyline points=\"{}\" fill=\"none\" stroke=\"{stroke}\" stroke-width=\"{}\" stroke-linejoin=\"round\" stroke-linecap=\"butt\"{dash}{opacity}/>",
            p.join(" "),
            n(width)
        );
    }

    pub fn line(&mut self, a: (f64, f64), b: (f64, f64), stroke: &str, width: f64) {
        self.polyline(&[a, b], stroke, width, "", 1.0);
    }

    pub fn polygon(&mut self, pts: &[(f64, f64)], fill: &str, opacity: f64) {
        let p: Vec<String> = pts
            .iter()
            .map(|(x, y)| format!("{},{}", n(*x), n(*y)))
            .collect();
        let _ = writeln!(
            self.out,
            "<polygon points=\"{}\" fill=\"{fill}\" fill-opacity=\"{}\" stroke=\"none\"/>",
            p.join(" "),
            n(opacity)
        );
    }

    pub fn rect(&mut self, r: Rect, fill: &str, stroke: &str) {
        let _ = writeln!(
            self.out,
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{fill}\" stroke=\"{stroke}\"/>",
            n(r.x0),
            n(r.y0),
            n(r.x1 - r.x0),
            n(r.y1 - r.y0)
        );
    }

    /// A marker of half-size `r` centred on `(x, y)`; `fill` "none" draws it open.
    pub fn marker(&mut self, shape: Shape, x: f64, y: f64, r: f64, fill: &str, stroke: &str) {
        let attrs = format!("fill=\"{fill}\" stroke=\"{stroke}\" stroke-width=\"1.3\"");
        let _ = match shape {
            Shape::Circle => writeln!(
                self.out,
                "<circle cx=\"{}\" cy=\"{}\" r=\"{}\" {attrs}/>",
                n(x),
                n(y),
                n(r)
            ),
            _ => {
                let pts: Vec<(f64, f64)> = match shape {
                    Shape::Square => {
                        let s = r * 0.88;
                        vec![
                            (x - s, y - s),
                            (x + s, y - s),
                            (x + s, y + s),
                            (x - s, y + s),
                        ]
                    }
                    Shape::TriangleUp => vec![
                        (x, y - r * 1.15),
                        (x + r, y + r * 0.75),
                        (x - r, y + r * 0.75),
                    ],
                    Shape::TriangleDown => vec![
                        (x, y + r * 1.15),
                        (x + r, y - r * 0.75),
                        (x - r, y - r * 0.75),
                    ],
                    _ => vec![(x, y - r * 1.2), (x + r, y), (x, y + r * 1.2), (x - r, y)],
                };
                let p: Vec<String> = pts
                    .iter()
                    .map(|(x, y)| format!("{},{}", n(*x), n(*y)))
                    .collect();
                writeln!(self.out, "<polygon points=\"{}\" {attrs}/>", p.join(" "))
            }
        };
    }
}

/// One axis: its range, whether it is logarithmic, and where it is drawn.
#[derive(Clone, Copy)]
pub struct Scale {
    pub lo: f64,
    pub hi: f64,
    pub log: bool,
    /// Pixel positions of `lo` and `hi`.
    pub from: f64,
    pub to: f64,
}

impl Scale {
    pub fn at(&self, v: f64) -> f64 {
        let f = if self.log {
            (v.log10() - self.lo.log10()) / (self.hi.log10() - self.lo.log10())
        } else {
            (v - self.lo) / (self.hi - self.lo)
        };
        self.from + f * (self.to - self.from)
    }
}

/// A plot area with its two axes.
pub struct Frame {
    pub area: Rect,
    pub x: Scale,
    pub y: Scale,
}

impl Frame {
    pub fn at(&self, (x, y): (f64, f64)) -> (f64, f64) {
        (self.x.at(x), self.y.at(y))
    }

    /// Grid lines at labelled ticks, tick marks, tick labels, the frame and the axis
    /// descriptions.
    pub fn draw(&self, svg: &mut Svg, xt: &[Tick], yt: &[Tick], x_desc: &str, y_desc: &str) {
        const TICK_FONT: f64 = 14.0;
        let a = self.area;
        for t in xt {
            let x = self.x.at(t.value);
            if t.label.is_some() {
                svg.line((x, a.y0), (x, a.y1), GRID, 1.0);
            }
        }
        for t in yt {
            let y = self.y.at(t.value);
            if t.label.is_some() {
                svg.line((a.x0, y), (a.x1, y), GRID, 1.0);
            }
        }
        svg.rect(a, "none", "#444444");
        for t in xt {
            let x = self.x.at(t.value);
            let len = if t.label.is_some() { 6.0 } else { 3.5 };
            svg.line((x, a.y1), (x, a.y1 + len), "#444444", 1.0);
            if let Some(l) = &t.label {
                svg.text(
                    x,
                    a.y1 + 9.0,
                    TICK_FONT,
                    Anchor::Middle,
                    l,
                    INK,
                    false,
                    false,
                );
            }
        }
        for t in yt {
            let y = self.y.at(t.value);
            let len = if t.label.is_some() { 6.0 } else { 3.5 };
            svg.line((a.x0 - len, y), (a.x0, y), "#444444", 1.0);
            if let Some(l) = &t.label {
                svg.text(
                    a.x0 - 9.0,
                    y - TICK_FONT / 2.0,
                    TICK_FONT,
                    Anchor::End,
                    l,
                    INK,
                    false,
                    false,
                );
            }
        }
        svg.text(
            (a.x0 + a.x1) / 2.0,
            a.y1 + 34.0,
            17.0,
            Anchor::Middle,
            x_desc,
            INK,
            false,
            false,
        );
        let widest = yt
            .iter()
            .filter_map(|t| t.label.as_deref())
            .map(|l| text_size(l, TICK_FONT).0)
            .fold(0.0, f64::max);
        svg.text_up(
            a.x0 - 9.0 - widest - 14.0 - 17.0,
            (a.y0 + a.y1) / 2.0,
            17.0,
            y_desc,
        );
    }
}

/// Lines of at most `width` pixels at `size`, broken at spaces (a word longer than a line
/// gets a line of its own).
pub fn wrap(text: &str, size: f64, width: f64) -> Vec<String> {
    let max = ((width / text_size("x", size).0).floor() as usize).max(10);
    let mut out = Vec::new();
    let mut line = String::new();
    for word in text.split(' ') {
        if !line.is_empty() && line.chars().count() + word.chars().count() + 1 > max {
            out.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() {
        out.push(line);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_halo_is_a_white_copy_under_the_text_not_a_paint_order_stroke() {
        let drawn = |halo: bool| {
            let mut s = Svg::new();
            s.text(
                10.0,
                10.0,
                12.0,
                Anchor::Start,
                "Orrin b",
                "#123456",
                false,
                halo,
            );
            s.finish(100.0, 50.0)
        };
        let doc = drawn(true);
        assert!(!doc.contains("paint-order"), "{doc}");
        let halo = doc
            .find("fill=\"#ffffff\" stroke=\"#ffffff\"")
            .expect("a white copy");
        let text = doc
            .find("fill=\"#123456\">Orrin b</text>")
            .expect("the text");
        // Drawn first, so it lies under the text in every renderer.
        assert!(halo < text, "{doc}");
        // Without a halo, only the text.
        assert_eq!(drawn(false).matches("<text").count(), 1);
    }
}
