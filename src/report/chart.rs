//! SVG charts drawn with plotters: lightest mass against span (a step plot
//! labelled with the section at each change), and maximum span per section
//! for each column of a span table (grouped horizontal bars). Charts are
//! returned as SVG text; they compute nothing.

use plotters::prelude::*;

const PALETTE: [RGBColor; 6] = [
    RGBColor(31, 119, 180),
    RGBColor(214, 39, 40),
    RGBColor(44, 160, 44),
    RGBColor(148, 103, 189),
    RGBColor(255, 127, 14),
    RGBColor(23, 190, 207),
];

fn nice_max(v: f64) -> f64 {
    if v <= 0.0 {
        return 1.0;
    }
    let p = 10f64.powf(v.log10().floor());
    for m in [1.0, 1.2, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0, 8.0, 10.0] {
        if m * p >= v * 1.05 {
            return m * p;
        }
    }
    10.0 * p
}

/// Step plot of the lightest passing mass against span. `points` are
/// (span, mass, section name) in display units; `None` mass = nothing passes.
pub fn lightest_chart(
    title: &str,
    x_label: &str,
    y_label: &str,
    points: &[(f64, Option<f64>, String)],
) -> String {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (900, 540)).into_drawing_area();
        let _ = root.fill(&WHITE);
        let xs: Vec<f64> = points.iter().map(|p| p.0).collect();
        let (x0, x1) = (
            xs.iter().copied().fold(f64::INFINITY, f64::min),
            xs.iter().copied().fold(f64::NEG_INFINITY, f64::max),
        );
        let step = if points.len() > 1 {
            (x1 - x0) / (points.len() - 1) as f64
        } else {
            1.0
        };
        let ymax = nice_max(points.iter().filter_map(|p| p.1).fold(0.0, f64::max));
        let Ok(mut chart) = ChartBuilder::on(&root)
            .caption(title, ("sans-serif", 22))
            .margin(20)
            .x_label_area_size(50)
            .y_label_area_size(70)
            .build_cartesian_2d((x0 - step / 2.0)..(x1 + step / 2.0), 0.0..ymax)
        else {
            return svg_fallback(title);
        };
        let _ = chart
            .configure_mesh()
            .x_desc(x_label)
            .y_desc(y_label)
            .axis_desc_style(("sans-serif", 16))
            .label_style(("sans-serif", 14))
            .light_line_style(RGBColor(235, 235, 235))
            .draw();
        // Steps: each span's value holds over [x − step/2, x + step/2].
        let mut line: Vec<(f64, f64)> = Vec::new();
        for p in points {
            if let Some(m) = p.1 {
                line.push((p.0 - step / 2.0, m));
                line.push((p.0 + step / 2.0, m));
            } else if !line.is_empty() {
                let _ = chart.draw_series(LineSeries::new(
                    std::mem::take(&mut line),
                    PALETTE[0].stroke_width(3),
                ));
            }
        }
        if !line.is_empty() {
            let _ = chart.draw_series(LineSeries::new(line, PALETTE[0].stroke_width(3)));
        }
        // Label the section at each change.
        let mut last = String::new();
        let mut alternate = false;
        for p in points {
            if let Some(m) = p.1
                && p.2 != last
            {
                last = p.2.clone();
                alternate = !alternate;
                let dy = if alternate { -10 } else { -28 };
                let _ = chart.draw_series(std::iter::once(
                    EmptyElement::at((p.0 - step / 2.0, m))
                        + Circle::new((0, 0), 4, PALETTE[1].filled())
                        + Text::new(p.2.clone(), (4, dy), ("sans-serif", 13).into_font()),
                ));
            }
        }
        let _ = root.present();
    }
    svg
}

/// Grouped horizontal bars: for each section (a row), the maximum span of
/// each column. `spans[c][r]` in display units (None: no passing span).
pub fn span_chart(
    title: &str,
    x_label: &str,
    sections: &[String],
    columns: &[String],
    spans: &[Vec<Option<f64>>],
) -> String {
    let mut svg = String::new();
    {
        let band = 14 + 9 * columns.len() as u32;
        let h = 120 + band * sections.len() as u32;
        let root = SVGBackend::with_string(&mut svg, (900, h.max(300))).into_drawing_area();
        let _ = root.fill(&WHITE);
        let xmax = nice_max(
            spans
                .iter()
                .flatten()
                .flatten()
                .copied()
                .fold(0.0, f64::max),
        );
        let n = sections.len();
        let label_width = 12
            + 8 * sections
                .iter()
                .map(|s| s.chars().count())
                .max()
                .unwrap_or(4) as u32;
        let Ok(mut chart) = ChartBuilder::on(&root)
            .caption(title, ("sans-serif", 22))
            .margin(20)
            .x_label_area_size(50)
            .y_label_area_size(label_width.min(300))
            .build_cartesian_2d(0.0..xmax, 0.0..n as f64)
        else {
            return svg_fallback(title);
        };
        let names = sections.to_vec();
        let _ = chart
            .configure_mesh()
            .disable_y_mesh()
            .x_desc(x_label)
            .axis_desc_style(("sans-serif", 16))
            .label_style(("sans-serif", 13))
            .y_labels(n.min(200) * 2 + 1)
            .y_label_formatter(&|y: &f64| {
                let k = (y - 0.5).round();
                if (y - 0.5 - k).abs() < 1e-6 && k >= 0.0 && (k as usize) < names.len() {
                    names[names.len() - 1 - k as usize].clone()
                } else {
                    String::new()
                }
            })
            .light_line_style(RGBColor(235, 235, 235))
            .draw();
        let nc = columns.len().max(1) as f64;
        for (c, col) in columns.iter().enumerate() {
            let color = PALETTE[c % PALETTE.len()];
            let bars = (0..n).filter_map(|r| {
                let v = spans.get(c)?.get(r).copied().flatten()?;
                // The first column on top, in legend order.
                let y0 = (n - 1 - r) as f64 + 0.1 + 0.8 * (nc - 1.0 - c as f64) / nc;
                let y1 = y0 + 0.8 / nc;
                Some(Rectangle::new([(0.0, y0), (v, y1)], color.filled()))
            });
            let _ = chart.draw_series(bars).map(|s| {
                s.label(col.clone()).legend(move |(x, y)| {
                    Rectangle::new([(x, y - 5), (x + 14, y + 5)], color.filled())
                })
            });
        }
        let _ = chart
            .configure_series_labels()
            .background_style(WHITE.mix(0.9))
            .border_style(BLACK)
            .label_font(("sans-serif", 14))
            .position(SeriesLabelPosition::LowerRight)
            .draw();
        let _ = root.present();
    }
    svg
}

/// A diagram along the beam: one or two curves (an envelope), filled to
/// the axis, with marked extremes. Values in display units, as plotted
/// (upward on the page positive); with `flipped` the quantity is plotted
/// negated (a downward-positive deflection drawn downward) and the scale
/// is labelled with the quantity itself, so it reads positive downward.
pub fn beam_diagram(
    title: &str,
    x_label: &str,
    y_label: &str,
    curves: &[Vec<(f64, f64)>],
    marks: &[(f64, f64, String)],
    supports: &[f64],
    flipped: bool,
) -> String {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (820, 300)).into_drawing_area();
        let _ = root.fill(&WHITE);
        let xs = curves.iter().flatten().map(|p| p.0);
        let (x0, x1) = xs.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), x| {
            (a.min(x), b.max(x))
        });
        let ys: Vec<f64> = curves.iter().flatten().map(|p| p.1).collect();
        let (y0, y1) = ys
            .iter()
            .fold((0.0f64, 0.0f64), |(a, b), &y| (a.min(y), b.max(y)));
        let pad = 0.18 * (y1 - y0).max(1e-9);
        let (x0, x1) = if x0.is_finite() { (x0, x1) } else { (0.0, 1.0) };
        let Ok(mut chart) = ChartBuilder::on(&root)
            .caption(title, ("sans-serif", 18))
            .margin(14)
            .x_label_area_size(40)
            .y_label_area_size(70)
            .build_cartesian_2d(x0..x1, (y0 - pad)..(y1 + pad))
        else {
            return svg_fallback(title);
        };
        let _ = chart
            .configure_mesh()
            .x_desc(x_label)
            .y_desc(y_label)
            .axis_desc_style(("sans-serif", 14))
            .label_style(("sans-serif", 12))
            .light_line_style(RGBColor(238, 238, 238))
            .y_label_formatter(&|y: &f64| {
                let v = if flipped { -*y } else { *y };
                // Rounding noise at the axis reads 0, not "-1e-16".
                let v = if v.abs() <= 1e-9 * (y1 - y0).abs() {
                    0.0
                } else {
                    v
                };
                crate::units::fmt_num(v)
            })
            .draw();
        let _ = chart.draw_series(LineSeries::new(
            vec![(x0, 0.0), (x1, 0.0)],
            BLACK.stroke_width(1),
        ));
        for (i, c) in curves.iter().enumerate() {
            let color = PALETTE[i % 2];
            let _ = chart.draw_series(AreaSeries::new(c.iter().copied(), 0.0, color.mix(0.15)));
            let _ = chart.draw_series(LineSeries::new(c.iter().copied(), color.stroke_width(2)));
        }
        for &s in supports {
            let _ = chart.draw_series(std::iter::once(TriangleMarker::new(
                (s, 0.0),
                7,
                BLACK.filled(),
            )));
        }
        for (x, y, text) in marks {
            let above = *y >= 0.0;
            // Near the right end, put the label to the left of the point.
            let dx = if (*x - x0) > 0.7 * (x1 - x0) {
                -8 - 7 * text.chars().count() as i32
            } else {
                6
            };
            let _ = chart.draw_series(std::iter::once(
                EmptyElement::at((*x, *y))
                    + Circle::new((0, 0), 4, PALETTE[1].filled())
                    + Text::new(
                        text.clone(),
                        (dx, if above { -18 } else { 6 }),
                        ("sans-serif", 13).into_font(),
                    ),
            ));
        }
        let _ = root.present();
    }
    svg
}

fn svg_fallback(title: &str) -> String {
    format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"600\" height=\"80\"><text x=\"10\" y=\"40\">{}: nothing to plot</text></svg>",
        super::html::esc(title)
    )
}

/// One load on the load diagram, in display units, with its label.
pub enum Glyph {
    /// A line load from x1 to x2, intensities w1 to w2.
    Line { x1: f64, x2: f64, w1: f64, w2: f64 },
    /// A point force at x (downward positive).
    Force { x: f64, p: f64 },
    /// A point moment at x (clockwise positive).
    Couple { x: f64 },
}

/// The load diagram: the beam with its supports (node positions and the
/// support's name), and above it one lane per load case with its line
/// loads (drawn to scale within the lane, the largest intensity filling
/// it), point forces (arrows) and moments (a ring), each labelled.
/// Positions and values in display units.
pub fn load_diagram(
    title: &str,
    x_label: &str,
    length: f64,
    supports: &[(f64, String)],
    cases: &[(String, Vec<(Glyph, String)>)],
) -> String {
    let mut svg = String::new();
    {
        let lanes = cases.len().max(1);
        let h = 110 + 90 * lanes as u32;
        let root = SVGBackend::with_string(&mut svg, (820, h)).into_drawing_area();
        let _ = root.fill(&WHITE);
        let pad = 0.04 * length.max(1e-9);
        let Ok(mut chart) = ChartBuilder::on(&root)
            .caption(title, ("sans-serif", 18))
            .margin(14)
            .x_label_area_size(40)
            .y_label_area_size(70)
            .build_cartesian_2d(-pad..(length + pad), -0.6..(lanes as f64 + 0.1))
        else {
            return svg_fallback(title);
        };
        let names: Vec<String> = cases.iter().map(|c| c.0.clone()).collect();
        let _ = chart
            .configure_mesh()
            .disable_y_mesh()
            .x_desc(x_label)
            .axis_desc_style(("sans-serif", 14))
            .label_style(("sans-serif", 12))
            .y_labels(2 * lanes + 2)
            .y_label_formatter(&|y: &f64| {
                // A case's name at the middle of its lane.
                let k = (*y - 0.5).round();
                if (*y - 0.5 - k).abs() < 1e-6 && k >= 0.0 && (k as usize) < names.len() {
                    names[k as usize].clone()
                } else {
                    String::new()
                }
            })
            .light_line_style(RGBColor(238, 238, 238))
            .draw();
        // The beam and its supports.
        let _ = chart.draw_series(LineSeries::new(
            vec![(0.0, 0.0), (length, 0.0)],
            BLACK.stroke_width(4),
        ));
        for (x, kind) in supports {
            let _ = chart.draw_series(std::iter::once(
                EmptyElement::at((*x, 0.0))
                    + TriangleMarker::new((0, 9), 9, BLACK.filled())
                    + Text::new(kind.clone(), (-14, 20), ("sans-serif", 12).into_font()),
            ));
        }
        let font = ("sans-serif", 12).into_font();
        for (k, (_, glyphs)) in cases.iter().enumerate() {
            let base = k as f64 + 0.08;
            let color = PALETTE[k % PALETTE.len()];
            let wmax = glyphs
                .iter()
                .filter_map(|g| match g.0 {
                    Glyph::Line { w1, w2, .. } => Some(w1.abs().max(w2.abs())),
                    _ => None,
                })
                .fold(0.0, f64::max);
            let _ = chart.draw_series(LineSeries::new(
                vec![(0.0, base), (length, base)],
                RGBColor(200, 200, 200).stroke_width(1),
            ));
            let mut label_row = 0;
            for (g, text) in glyphs {
                match *g {
                    Glyph::Line { x1, x2, w1, w2 } => {
                        let top = |w: f64| base + 0.6 * w.abs() / wmax.max(1e-12);
                        let _ = chart.draw_series(std::iter::once(Polygon::new(
                            vec![(x1, base), (x1, top(w1)), (x2, top(w2)), (x2, base)],
                            color.mix(0.25).filled(),
                        )));
                        let _ = chart.draw_series(LineSeries::new(
                            vec![(x1, base), (x1, top(w1)), (x2, top(w2)), (x2, base)],
                            color.stroke_width(1),
                        ));
                        let _ = chart.draw_series(std::iter::once(
                            EmptyElement::at((x1, top(w1).max(top(w2))))
                                + Text::new(text.clone(), (4, -14), font.clone()),
                        ));
                    }
                    Glyph::Force { x, p } => {
                        let (from, to) = if p >= 0.0 {
                            (base + 0.75, base)
                        } else {
                            (base, base + 0.75)
                        };
                        let _ = chart.draw_series(LineSeries::new(
                            vec![(x, from), (x, to)],
                            BLACK.stroke_width(2),
                        ));
                        let (tip, dir) = if p >= 0.0 { (to, 7) } else { (to, -7) };
                        let _ = chart.draw_series(std::iter::once(
                            EmptyElement::at((x, tip))
                                + Polygon::new(vec![(0, 0), (-5, -dir), (5, -dir)], BLACK.filled()),
                        ));
                        label_row += 1;
                        let _ = chart.draw_series(std::iter::once(
                            EmptyElement::at((x, base + 0.75))
                                + Text::new(
                                    text.clone(),
                                    (5, -4 + 12 * (label_row % 2)),
                                    font.clone(),
                                ),
                        ));
                    }
                    Glyph::Couple { x } => {
                        let _ = chart.draw_series(std::iter::once(
                            EmptyElement::at((x, base + 0.3))
                                + Circle::new((0, 0), 9, BLACK.stroke_width(2))
                                + Text::new(text.clone(), (12, -6), font.clone()),
                        ));
                    }
                }
            }
        }
        let _ = root.present();
    }
    svg
}
