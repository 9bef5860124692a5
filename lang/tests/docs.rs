#![allow(clippy::unwrap_used, clippy::indexing_slicing)]
#[test]
fn gen() {
    use syzygy::ast::BodyKind;
    let mut s = String::new();
    for u in syzygy::units::all_units() {
        let al: Vec<String> = u.aliases.iter().map(|a| format!("`{a}`")).collect();
        s += &format!(
            "| `{}` | {} | {} | {:e} {} | {} | {} |\n",
            u.symbol,
            al.join(", "),
            u.name,
            u.factor,
            u.dim.si_unit(),
            if u.prefixes { "yes" } else { "no" },
            u.source
        );
    }
    s += "\n";
    for kind in [BodyKind::Star, BodyKind::Planet] {
        for q in syzygy::quantities::table()
            .iter()
            .filter(|q| q.kind == kind)
        {
            let al: Vec<String> = q.aliases.iter().map(|a| format!("`{a}`")).collect();
            s += &format!(
                "| `{}` | {} | {} | {} | {} | {} |\n",
                q.name,
                al.join(", "),
                if q.text {
                    "text".to_string()
                } else {
                    q.dim.describe()
                },
                q.range_text(),
                q.display,
                q.doc
            );
        }
        s += "\n";
    }
    std::fs::write("/tmp/docs_gen/tables.md", s).unwrap();
}
