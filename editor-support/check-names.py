"""The editor set-ups spell out the language's keywords, quantity names, functions and
constants for highlighting. This check reads them from the language's own sources
(lang/src/syntax/lexer.rs, quantities.rs, model/mod.rs) and fails when an editor file misses one or
lists one the language no longer has.

Run: python3 editor-support/check-names.py
"""

import json
import os
import re
import sys

SUPPORT = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(SUPPORT)


def read(*parts):
    with open(os.path.join(*parts), encoding="utf-8") as f:
        return f.read()


def language_names():
    lexer = read(ROOT, "lang", "src", "syntax", "lexer.rs")
    keywords = set(re.findall(r'#\[token\("([a-z]+)"\)\]', lexer))
    quantities = set()
    for name, aliases in re.findall(
        r'q!\(\s*\w+\s*,\s*\w+\s*,\s*"([^"]+)"\s*,\s*\[([^\]]*)\]', read(ROOT, "lang", "src", "quantities.rs")
    ):
        quantities.add(name)
        quantities.update(re.findall(r'"([^"]+)"', aliases))
    model = read(ROOT, "lang", "src", "model", "mod.rs")
    block = re.search(r"pub const FUNCTIONS: &\[&str\] = &\[(.*?)\];", model, re.S)
    functions = set(re.findall(r'"([^"]+)"', block.group(1))) if block else set()
    body = re.search(r"pub fn constant\(.*?\n}\n", model, re.S)
    constants = set(re.findall(r'^\s*"([^"]+)" =>', body.group(0), re.M)) if body else set()
    return {"keywords": keywords, "quantities": quantities, "functions": functions, "constants": constants}


def name_characters():
    """The non-ASCII characters the lexer accepts in a name."""
    lexer = read(ROOT, "lang", "src", "syntax", "lexer.rs")
    m = re.search(r'#\[regex\(r"(\[[^"]*)"\)\]\s*(?:#\[token\("%"\)\]\s*)?Ident,', lexer)
    if not m:
        return set()
    return {chr(int(h, 16)) for h in re.findall(r"\\u\{([0-9A-Fa-f]+)\}", m.group(1))}


def alternatives(pattern):
    """Words of the alternations `(?:a|b|c)` or `\\%(a\\|b\\)` in a regex."""
    return set(w for w in re.split(r"\\?\|", pattern) if re.fullmatch(r"[\w\u03c9]+", w))


def textmate_names():
    g = json.loads(read(SUPPORT, "vscode", "syntaxes", "syzygy.tmLanguage.json"))
    repo = g["repository"]
    prop = repo["property"]["patterns"][0]["match"]
    qty = re.search(r"\(\(\?:([^()]*)\)", prop).group(1)
    decl = [p for p in repo["declaration"]["patterns"] if "name" in p][-1]["match"]
    exprs = repo["expression"]["patterns"]
    func = next(p["match"] for p in exprs if p.get("name") == "support.function.builtin.syzygy")
    const = next(p["match"] for p in exprs if p.get("name") == "constant.language.syzygy")
    inner = lambda m: re.search(r"\(([^()]*\|[^()]*)\)", m).group(1)
    return {
        "keywords": alternatives(re.search(r"\((system[^)]*)\)", decl).group(1)),
        "quantities": alternatives(qty),
        "functions": alternatives(inner(func)),
        "constants": alternatives(inner(const)),
    }


def vim_names():
    src = read(SUPPORT, "neovim", "syntax", "syzygy.vim")
    qty_block = re.search(r"let s:qty = '\\%\('\n(.*?)\n\s*\\ \. '\\\)'", src, re.S).group(1)
    qty = "".join(re.findall(r"'([^']*)'", qty_block))
    return {
        "keywords": set(re.search(r"syn keyword syzygyKeyword (.*)", src).group(1).split()),
        "quantities": alternatives(qty),
        "functions": alternatives(re.search(r"syzygyFunction /\\<\\%\((.*?)\\\)", src).group(1)),
        "constants": alternatives(re.search(r"syzygyConstant /\\<\\%\((.*?)\\\)", src).group(1)),
    }


def emacs_names():
    src = read(SUPPORT, "emacs", "syzygy-mode.el")

    def strings_of(const):
        block = re.search(r"\(defconst " + const + r"\s+'\((.*?)\)\s*\n?\s*\"", src, re.S).group(1)
        block = re.sub(r";[^\n]*", "", block)
        return set(re.findall(r'"([^"]+)"', block))

    return {
        "keywords": strings_of("syzygy-keywords"),
        "quantities": strings_of("syzygy-quantity-names"),
        "functions": strings_of("syzygy-functions"),
        "constants": strings_of("syzygy-constants"),
    }


def main():
    want = language_names()
    ok = all(want.values())
    if not ok:
        print("  FAIL could not read the names from lang/src:", {k: len(v) for k, v in want.items()})
        return 1
    failures = 0
    for editor, read_names in (("vscode grammar", textmate_names), ("vim syntax", vim_names),
                               ("emacs mode", emacs_names)):
        try:
            have = read_names()
        except (AttributeError, KeyError, StopIteration, ValueError) as e:
            print(f"  FAIL {editor}: could not find its name lists ({e!r})")
            failures += 1
            continue
        for kind, names in want.items():
            missing = sorted(names - have[kind])
            extra = sorted(have[kind] - names)
            if missing or extra:
                failures += 1
                print(f"  FAIL {editor} {kind}: missing {missing}, not in the language {extra}")
            else:
                print(f"  ok   {editor} {kind} ({len(names)})")
    chars = name_characters()
    if not chars:
        print("  FAIL could not read the name characters from lang/src/syntax/lexer.rs")
        failures += 1
    grammar = read(SUPPORT, "vscode", "syntaxes", "syzygy.tmLanguage.json")
    for editor, text in (("vscode grammar", grammar.replace("\\x{", "\\u{")),
                         ("vim syntax", read(SUPPORT, "neovim", "syntax", "syzygy.vim")),
                         ("emacs mode", read(SUPPORT, "emacs", "syzygy-mode.el"))):
        absent = sorted(c for c in chars
                        if c not in text and ("\\u{%04X}" % ord(c)) not in text.upper().replace("\\U{", "\\u{"))
        if absent:
            failures += 1
            print(f"  FAIL {editor} name characters: missing {absent}")
        else:
            print(f"  ok   {editor} name characters ({len(chars)})")
    print(f"names: {failures} lists out of step")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
