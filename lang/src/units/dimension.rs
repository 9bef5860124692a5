//! Dimensions: products of the base dimensions with small exact rational exponents.

use std::fmt;

/// A small exact rational number for dimension exponents.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Rat {
    num: i16,
    den: i16,
}

impl Rat {
    pub const ZERO: Rat = Rat { num: 0, den: 1 };
    pub const ONE: Rat = Rat { num: 1, den: 1 };

    pub fn new(num: i32, den: i32) -> Rat {
        let g = gcd(num.unsigned_abs(), den.unsigned_abs()).max(1) as i32;
        let sign = if den < 0 { -1 } else { 1 };
        Rat {
            num: clamp_i16(sign * num / g),
            den: clamp_i16((sign * den / g).max(1)),
        }
    }

    pub fn int(n: i32) -> Rat {
        Rat {
            num: clamp_i16(n),
            den: 1,
        }
    }

    // Whole exponents (nearly every unit) skip the reduction, which gives the same result.
    pub(super) fn add(self, o: Rat) -> Rat {
        if self.den == 1 && o.den == 1 {
            return Rat::int(i32::from(self.num) + i32::from(o.num));
        }
        Rat::new(
            i32::from(self.num) * i32::from(o.den) + i32::from(o.num) * i32::from(self.den),
            i32::from(self.den) * i32::from(o.den),
        )
    }

    pub(super) fn mul(self, o: Rat) -> Rat {
        if self.den == 1 && o.den == 1 {
            return Rat::int(i32::from(self.num) * i32::from(o.num));
        }
        Rat::new(
            i32::from(self.num) * i32::from(o.num),
            i32::from(self.den) * i32::from(o.den),
        )
    }

    pub fn is_zero(self) -> bool {
        self.num == 0
    }

    pub fn as_f64(self) -> f64 {
        f64::from(self.num) / f64::from(self.den)
    }
}

fn clamp_i16(v: i32) -> i16 {
    v.clamp(i32::from(i16::MIN), i32::from(i16::MAX)) as i16
}

fn gcd(mut a: u32, mut b: u32) -> u32 {
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a
}

impl fmt::Display for Rat {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.den == 1 {
            write!(f, "{}", self.num)
        } else {
            write!(f, "({}/{})", self.num, self.den)
        }
    }
}

const BASE_NAMES: [&str; 5] = ["m", "kg", "s", "K", "rad"];

/// A product of base dimensions: length, mass, time, temperature, angle.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Dimension([Rat; 5]);

impl Dimension {
    pub const NONE: Dimension = Dimension([Rat::ZERO; 5]);
    pub const LENGTH: Dimension = Dimension::base(0);
    pub const MASS: Dimension = Dimension::base(1);
    pub const TIME: Dimension = Dimension::base(2);
    pub const TEMPERATURE: Dimension = Dimension::base(3);
    pub const ANGLE: Dimension = Dimension::base(4);

    // Only called with constant indexes below 5 (the constants above).
    #[allow(clippy::indexing_slicing)]
    const fn base(i: usize) -> Dimension {
        let mut e = [Rat::ZERO; 5];
        e[i] = Rat::ONE;
        Dimension(e)
    }

    /// From integer exponents of length, mass, time, temperature, angle.
    pub fn of(l: i32, m: i32, t: i32, temp: i32, angle: i32) -> Dimension {
        Dimension([
            Rat::int(l),
            Rat::int(m),
            Rat::int(t),
            Rat::int(temp),
            Rat::int(angle),
        ])
    }

    pub fn times(self, o: Dimension) -> Dimension {
        let mut e = self.0;
        for (a, b) in e.iter_mut().zip(o.0) {
            *a = a.add(b);
        }
        Dimension(e)
    }

    pub fn per(self, o: Dimension) -> Dimension {
        self.times(o.pow(Rat::int(-1)))
    }

    pub fn pow(self, p: Rat) -> Dimension {
        let mut e = self.0;
        for a in e.iter_mut() {
            *a = a.mul(p);
        }
        Dimension(e)
    }

    pub fn is_none(self) -> bool {
        self.0.iter().all(|r| r.is_zero())
    }

    /// The SI spelling of the dimension: `m^3 kg^-1 s^-2`, `1` when dimensionless.
    pub fn si_unit(self) -> String {
        if let Some(name) = self.si_name() {
            return name.to_string();
        }
        let parts: Vec<String> = BASE_NAMES
            .iter()
            .zip(self.0)
            .filter(|(_, e)| !e.is_zero())
            .map(|(n, e)| {
                if e == Rat::ONE {
                    (*n).to_string()
                } else {
                    format!("{n}^{e}")
                }
            })
            .collect();
        if parts.is_empty() {
            "1".to_string()
        } else {
            parts.join(" ")
        }
    }

    /// Conventional SI spellings for the dimensions the trade quotes most.
    fn si_name(self) -> Option<&'static str> {
        let table: [(Dimension, &str); 6] = [
            (Dimension::of(1, 0, -1, 0, 0), "m/s"),
            (Dimension::of(1, 0, -2, 0, 0), "m/s^2"),
            (Dimension::of(-3, 1, 0, 0, 0), "kg/m^3"),
            (Dimension::of(2, 1, -3, 0, 0), "W"),
            (Dimension::of(0, 1, -3, 0, 0), "W/m^2"),
            (Dimension::of(3, -1, -2, 0, 0), "m^3 kg^-1 s^-2"),
        ];
        table.iter().find(|(d, _)| *d == self).map(|(_, n)| *n)
    }

    /// A plain-English name where one exists ("length", "speed"), else the SI spelling.
    pub fn describe(self) -> String {
        let names: [(Dimension, &str); 16] = [
            (Dimension::NONE, "a dimensionless number"),
            (Dimension::LENGTH, "a length"),
            (Dimension::MASS, "a mass"),
            (Dimension::TIME, "a time"),
            (Dimension::TEMPERATURE, "a temperature"),
            (Dimension::ANGLE, "an angle"),
            (Dimension::of(1, 0, -1, 0, 0), "a speed"),
            (Dimension::of(1, 0, -2, 0, 0), "an acceleration"),
            (Dimension::of(-3, 1, 0, 0, 0), "a density"),
            (Dimension::of(2, 1, -3, 0, 0), "a power"),
            (Dimension::of(0, 1, -3, 0, 0), "a flux (power per area)"),
            (Dimension::of(2, 0, 0, 0, 0), "an area"),
            (Dimension::of(3, 0, 0, 0, 0), "a volume"),
            (Dimension::of(0, 0, -1, 0, 0), "a frequency"),
            (Dimension::of(2, 1, -2, 0, 0), "an energy"),
            (Dimension::of(1, 1, -2, 0, 0), "a force"),
        ];
        match names.iter().find(|(d, _)| *d == self) {
            Some((_, n)) => format!("{n} ({})", self.si_unit()),
            None => format!("dimension {}", self.si_unit()),
        }
    }
}

impl fmt::Display for Dimension {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.si_unit())
    }
}
