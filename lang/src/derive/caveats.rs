//! Notes a result carries where its formula's assumptions may fail for the values at hand:
//! a grazing transit, a TSM whose radius straddles a bin edge, a habitable zone at the end
//! of its fits.

use super::*;

impl Derivation<'_> {
    /// A value's interval: its 16th and 84th percentiles where it was sampled (in Monte Carlo,
    /// or because first order could not describe it), else the value less and plus its
    /// first-order spread.
    fn interval(&self, key: Key) -> Option<(f64, f64)> {
        let v = &self.entries.get(&key)?.value;
        Some(
            match v
                .sample_summary()
                .or_else(|| self.sampled_instead(key).map(|s| s.0))
            {
                Some(s) => (s.low, s.high),
                None => {
                    let (below, above) = v.linear_spread(&self.inputs);
                    (v.nominal - below, v.nominal + above)
                }
            },
        )
    }

    /// On a grazing transit, what that means for the radius ratio and the depth: which of the
    /// two was found from the other and the impact parameter, and that there is no full
    /// duration.
    pub(super) fn grazing_note(&self, key: Key, entry: &Entry) -> Option<String> {
        let b = self.entries.get(&(key.0, Qty::Impact))?.value.nominal;
        let k = self.entries.get(&(key.0, Qty::RadiusRatio))?.value.nominal;
        // Past 1 + k there is no transit at all, which the transit-geometry check reports.
        if !crate::physics::formulas::is_grazing(k, b) || b.abs() >= 1.0 + k {
            return None;
        }
        let rule = entry.rule.and_then(|r| RULES.get(r)).map(|r| r.id);
        let how = match (key.1, rule) {
            (Qty::RadiusRatio, Some("depth-impact-radius-ratio")) => {
                "; k is solved from the depth and b (not sqrt(depth)) and rests heavily on b,"
            }
            (Qty::TransitDepth, Some("radius-ratio-impact-depth")) => {
                "; the depth is the covered fraction of the star's disc, less than k^2, and rests heavily on b,"
            }
            // The depth note is enough where neither was found from the other.
            (Qty::TransitDepth, _) => return None,
            _ => ",",
        };
        Some(format!(
            "grazing transit: the impact parameter {} exceeds 1 - k = {}, so only part of the planet's disc covers the star{how} and there is no full (T23) duration",
            crate::format::sig(b, 3),
            crate::format::sig(1.0 - k, 3)
        ))
    }

    /// Where the planet's radius interval spans an edge of the TSM's radius bins, whose scale
    /// factor jumps there (from 0.190 to 1.26 at 1.5 Rearth): the metric's distribution then
    /// has a peak on each side, its median may lie between them, and a first-order error
    /// budget cannot describe a step.
    pub(super) fn tsm_bin_note(&self, key: Key) -> Option<String> {
        let (lo, hi) = self.interval((key.0, Qty::Radius))?;
        let earth = crate::constants::R_EARTH;
        let (lo, hi) = (lo / earth, hi / earth);
        let f = crate::physics::formulas::tsm_scale_factor;
        let edges: Vec<String> = [1.5, 2.75, 4.0]
            .into_iter()
            .filter(|&edge| lo < edge && edge < hi)
            .map(|edge| {
                format!(
                    "{edge} Rearth (scale factor {} below, {} above)",
                    f(edge - 1e-9),
                    f(edge)
                )
            })
            .collect();
        (!edges.is_empty()).then(|| {
            format!(
                "the radius's interval ({} to {} Rearth) spans the edge of the metric's radius bins at {} (Kempton et al. 2018, Table 1): the metric jumps there, so its distribution has a peak on each side and the median may lie between them, and a first-order error budget does not describe the jump; compare the metric at each side",
                crate::format::sig(lo, 3),
                crate::format::sig(hi, 3),
                edges.join(" and ")
            )
        })
    }

    /// Where the star's temperature interval reaches past the 2600-7200 K the habitable
    /// zone's fits hold for, while its value lies inside: the edges rest partly on the fits
    /// beyond their range (Monte Carlo leaves those draws out and says how many; first order
    /// extrapolates without a word, so this note says it for both).
    pub(super) fn habitable_range_note(&self, key: Key) -> Option<String> {
        let (lo, hi) = self.interval((key.0, Qty::Teff))?;
        let (min, max) = crate::physics::formulas::HABITABLE_TEFF_RANGE;
        let past = [(lo < min, min), (hi > max, max)]
            .into_iter()
            .filter(|(past, _)| *past)
            .map(|(_, edge)| format!("{edge} K"))
            .collect::<Vec<_>>();
        (!past.is_empty()).then(|| {
            format!(
                "the star's Teff interval ({} to {} K) reaches past {}, where the fits of Kopparapu et al. (2014) end: every habitable-zone edge of this star, and a planet's place against them, is less certain than its interval says",
                crate::format::sig(lo, 4),
                crate::format::sig(hi, 4),
                past.join(" and ")
            )
        })
    }
}
