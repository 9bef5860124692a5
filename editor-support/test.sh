#!/usr/bin/env bash
# Editor support tests: the VS Code grammar and extension, the name lists, the Helix
# configuration, and Neovim and Emacs end to end against the real `syz lsp`.
#
#   bash editor-support/test.sh          # a missing editor is SKIPPED
#   CI=true bash editor-support/test.sh  # a missing editor is a failure
#
# Installs what is missing when it can (Debian packages as root, npm ci in vscode/),
# builds `syz` and puts it on PATH. Set SYZYGY_NO_INSTALL=1 to install nothing.
# The last line is always `editor tests: N passed, M failed`.
set -uo pipefail

here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(dirname "$here")"
cd "$root" || exit 1

in_ci=false
case "${CI:-}" in true | 1 | yes) in_ci=true ;; esac

passed=0
failed=0
skipped=0
summary=()

now() { date +%s; }
took() { echo "$(($(now) - $1))s"; }

pass() {
  passed=$((passed + 1))
  summary+=("PASSED:  $1 ($2)")
}
fail() {
  failed=$((failed + 1))
  summary+=("FAILED:  $1 ($2)")
}
# A test whose tool is missing: skipped on a developer's machine, a failure in CI.
missing() {
  if $in_ci; then
    echo "FAILED: $1: $2 (required in CI)"
    fail "$1" "$2"
  else
    echo "SKIPPED: $1: $2"
    skipped=$((skipped + 1))
    summary+=("SKIPPED: $1 ($2)")
  fi
}

# Run one test: name, then the command. Output goes straight through.
run_test() {
  local name="$1"
  shift
  echo
  echo "== $name"
  local start
  start=$(now)
  if "$@"; then
    pass "$name" "$(took "$start")"
  else
    echo "FAILED: $name"
    fail "$name" "$(took "$start")"
  fi
}

can_install() {
  [ "${SYZYGY_NO_INSTALL:-0}" != 1 ] && [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null 2>&1
}

# ---------------------------------------------------------------- set-up

echo "== set-up"
want_pkgs=()
command -v nvim >/dev/null 2>&1 || want_pkgs+=(neovim)
command -v emacs >/dev/null 2>&1 || want_pkgs+=(emacs-nox)
[ -d /usr/share/emacs/site-lisp/elpa/eglot-1.9 ] || ls -d /usr/share/emacs/site-lisp/elpa/eglot-* >/dev/null 2>&1 ||
  want_pkgs+=(elpa-eglot)
command -v python3 >/dev/null 2>&1 || want_pkgs+=(python3)
if [ ${#want_pkgs[@]} -gt 0 ]; then
  if can_install; then
    start=$(now)
    echo "installing ${want_pkgs[*]} (apt)"
    if apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${want_pkgs[@]}" >/dev/null; then
      echo "apt install took $(took "$start")"
    else
      echo "apt install failed after $(took "$start")"
    fi
  else
    echo "not installing ${want_pkgs[*]} (needs root and apt-get; SYZYGY_NO_INSTALL=${SYZYGY_NO_INSTALL:-0})"
  fi
fi

have_node=false
if command -v node >/dev/null 2>&1 && command -v npm >/dev/null 2>&1; then
  node_major="$(node -p 'process.versions.node.split(".")[0]')"
  if [ "$node_major" -ge 20 ]; then
    have_node=true
  else
    echo "node $(node --version) is too old: the extension's tools need Node 20 or later"
  fi
fi
vscode_ready=false
if $have_node; then
  lock="$here/vscode/package-lock.json"
  stamp="$here/vscode/node_modules/.package-lock.json"
  if [ ! -f "$stamp" ] || [ "$lock" -nt "$stamp" ]; then
    if [ "${SYZYGY_NO_INSTALL:-0}" = 1 ]; then
      echo "not running npm ci (SYZYGY_NO_INSTALL=1)"
    else
      start=$(now)
      echo "npm ci in editor-support/vscode"
      if (cd "$here/vscode" && npm ci --no-audit --no-fund --loglevel=error); then
        echo "npm ci took $(took "$start")"
      else
        echo "npm ci failed after $(took "$start")"
      fi
    fi
  fi
  [ -f "$stamp" ] && vscode_ready=true
fi

start=$(now)
echo "cargo build -p syzygy-cli"
export CARGO_BUILD_JOBS="${CARGO_BUILD_JOBS:-1}"
syz_ready=false
if cargo build -p syzygy-cli --quiet; then
  syz_ready=true
  echo "cargo build took $(took "$start")"
else
  echo "cargo build failed"
fi
target_dir="${CARGO_TARGET_DIR:-$root/target}"
case "$target_dir" in /*) ;; *) target_dir="$root/$target_dir" ;; esac
export PATH="$target_dir/debug:$PATH"
if $syz_ready && ! syz lsp --help >/dev/null 2>&1; then
  echo "this syz has no 'lsp' command yet"
fi

# ---------------------------------------------------------------- tests

if $vscode_ready; then
  run_test "vscode grammar (vscode-tmgrammar-test)" \
    bash -c 'cd "$1/vscode" && npx --no-install vscode-tmgrammar-test "test/grammar/*.syz"' _ "$here"
  run_test "vscode extension: type check, unit tests, bundle, .vsix" bash -c '
    set -e
    cd "$1/vscode"
    npx --no-install tsc --noEmit
    npm run --silent test:unit
    rm -f syzygy-language.vsix
    npm run --silent package
    python3 - syzygy-language.vsix <<"EOF"
import sys, zipfile
names = set(zipfile.ZipFile(sys.argv[1]).namelist())
need = {"extension/package.json", "extension/out/extension.js", "extension/language-configuration.json",
        "extension/syntaxes/syzygy.tmLanguage.json", "extension/snippets/syzygy.json"}
stray = sorted(n for n in names if n.startswith(("extension/node_modules/", "extension/src/", "extension/test/")))
print("vsix holds", len(names), "files")
if need - names or stray:
    sys.exit(f"vsix: missing {sorted(need - names)}, should not hold {stray}")
EOF
  ' _ "$here"
else
  missing "vscode grammar (vscode-tmgrammar-test)" "Node 20+ and npm ci in editor-support/vscode"
  missing "vscode extension: type check, unit tests, bundle, .vsix" "Node 20+ and npm ci in editor-support/vscode"
fi

if command -v python3 >/dev/null 2>&1; then
  run_test "editor name lists match the language" python3 "$here/check-names.py"
  if $syz_ready; then
    run_test "helix languages.toml" timeout 60 python3 "$here/helix/test_languages.py"
  else
    echo "FAILED: helix languages.toml (syz did not build)"
    fail "helix languages.toml" "syz did not build"
  fi
else
  missing "editor name lists match the language" "python3 not installed"
  missing "helix languages.toml" "python3 not installed"
fi

if ! command -v nvim >/dev/null 2>&1; then
  missing "neovim end to end" "nvim not installed (apt-get install neovim)"
elif ! $syz_ready; then
  echo "FAILED: neovim end to end (syz did not build)"
  fail "neovim end to end" "syz did not build"
else
  run_test "neovim end to end" bash -c '
    cd "$1/neovim" &&
    timeout 180 nvim --headless -u test/minimal_init.lua -i NONE -c "luafile test/e2e.lua" </dev/null' _ "$here"
fi

eglot_ok() {
  emacs -Q --batch --eval "(progn (require 'package) (add-to-list 'package-directory-list \"/usr/share/emacs/site-lisp/elpa\") (package-initialize) (require 'eglot))" >/dev/null 2>&1
}
if ! command -v emacs >/dev/null 2>&1; then
  missing "emacs end to end" "emacs not installed (apt-get install emacs-nox elpa-eglot)"
elif ! eglot_ok; then
  missing "emacs end to end" "eglot not found (apt-get install elpa-eglot)"
elif ! $syz_ready; then
  echo "FAILED: emacs end to end (syz did not build)"
  fail "emacs end to end" "syz did not build"
else
  run_test "emacs end to end" bash -c '
    cd "$1" && timeout 180 emacs -Q --batch -l emacs/test/e2e.el </dev/null' _ "$here"
fi

echo
for line in "${summary[@]}"; do
  echo "$line"
done
[ "$skipped" -gt 0 ] && echo "($skipped skipped; skipped tests are not counted as passed)"
echo "editor tests: $passed passed, $failed failed"
[ "$failed" -eq 0 ]
