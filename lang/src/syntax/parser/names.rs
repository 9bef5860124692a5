//! Helps for property names written as papers and tables head their columns, which the
//! grammar cannot read as names: a ratio written as a fraction (`Rp/Rs`, `a/R*`) and a
//! bracketed abundance (`[Fe/H]`).

/// The help for a property name not followed by `=`, `<` or `>`: the quantity a ratio
/// written as a fraction stands for (`slash`: a `/` follows the name; `from_name`: the
/// source from the name on), else the form a property takes.
pub(super) fn property_name_help(name: &str, from_name: &str, slash: bool) -> String {
    let written = from_name
        .split(['=', '<', '>', '\n', ';'])
        .next()
        .unwrap_or("")
        .trim();
    match slash
        .then(|| crate::quantities::ratio_name(written))
        .flatten()
    {
        Some(q) => format!("`{written}` is written `{q}`: `{q} = VALUE`"),
        None => format!("write `{name} = VALUE UNIT`"),
    }
}

/// The help for a line that starts where a property name was expected, when it is the
/// metallicity as papers head its column (`[Fe/H] = 0.12`; `line`: the source from there on).
pub(super) fn bracketed_name_help(line: &str) -> Option<&'static str> {
    let start = line.split(['\n', ';']).next().unwrap_or("").trim_start();
    let lower = start.to_ascii_lowercase();
    (lower.starts_with("[fe/h]") || lower.starts_with("[m/h]"))
        .then_some("the metallicity is written `metallicity = VALUE dex` (or `feh`)")
}
