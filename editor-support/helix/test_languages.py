"""Checks editor-support/helix/languages.toml: it parses as TOML, registers the `syzygy`
language for *.syz with the `syzygy` server, and the server command it names really
speaks LSP (initialize, shutdown, exit over stdio). Helix itself is not installed here.

Run: python3 editor-support/helix/test_languages.py  (with `syz` on PATH)
"""

import json
import os
import shutil
import subprocess
import sys
import tomllib

HERE = os.path.dirname(os.path.abspath(__file__))
failures = []
passes = 0


def check(name, ok, detail=""):
    global passes
    if ok:
        passes += 1
        print(f"  ok   {name}")
    else:
        failures.append(name)
        print(f"  FAIL {name}{': ' + str(detail) if detail else ''}")
    return ok


def send(proc, message):
    body = json.dumps(message).encode()
    proc.stdin.write(b"Content-Length: %d\r\n\r\n" % len(body) + body)
    proc.stdin.flush()


def receive(proc):
    """One message from the server, or None at end of output."""
    length = None
    while True:
        line = proc.stdout.readline()
        if not line:
            return None
        line = line.strip()
        if not line:
            break
        name, _, value = line.partition(b":")
        if name.lower() == b"content-length":
            length = int(value)
    if length is None:
        return None
    return json.loads(proc.stdout.read(length))


def answer_to(proc, request_id):
    while True:
        message = receive(proc)
        if message is None or message.get("id") == request_id:
            return message


def main():
    with open(os.path.join(HERE, "languages.toml"), "rb") as f:
        try:
            config = tomllib.load(f)
        except tomllib.TOMLDecodeError as e:
            check("languages.toml parses as TOML", False, e)
            return
    check("languages.toml parses as TOML", True)

    languages = [l for l in config.get("language", []) if l.get("name") == "syzygy"]
    if not check("one [[language]] named syzygy", len(languages) == 1, config.get("language")):
        return
    lang = languages[0]
    check("it claims *.syz files", lang.get("file-types") == ["syz"], lang.get("file-types"))
    check("its scope is source.syzygy", lang.get("scope") == "source.syzygy", lang.get("scope"))
    check("comments start with #", lang.get("comment-token") == "#", lang.get("comment-token"))
    servers = lang.get("language-servers", [])
    check("it uses the syzygy language server", servers == ["syzygy"], servers)

    server = config.get("language-server", {}).get("syzygy")
    if not check("[language-server.syzygy] is defined", isinstance(server, dict), server):
        return
    command = [server.get("command")] + server.get("args", [])
    check("the server command is `syz lsp`", command == ["syz", "lsp"], command)

    program = shutil.which(command[0])
    if not check(f"`{command[0]}` is on PATH", program is not None, os.environ.get("PATH")):
        return
    proc = subprocess.Popen(
        [program] + command[1:], stdin=subprocess.PIPE, stdout=subprocess.PIPE, stderr=subprocess.PIPE
    )
    try:
        send(proc, {"jsonrpc": "2.0", "id": 1, "method": "initialize",
                    "params": {"processId": os.getpid(), "rootUri": None, "capabilities": {}}})
        init = answer_to(proc, 1)
        caps = (init or {}).get("result", {}).get("capabilities", {})
        check("the command answers initialize with capabilities", bool(caps), init)
        check("... including hover", bool(caps.get("hoverProvider")), caps)
        send(proc, {"jsonrpc": "2.0", "method": "initialized", "params": {}})
        send(proc, {"jsonrpc": "2.0", "id": 2, "method": "shutdown"})
        done = answer_to(proc, 2)
        check("... and shutdown", done is not None and "error" not in done, done)
        send(proc, {"jsonrpc": "2.0", "method": "exit"})
        proc.stdin.close()
        code = proc.wait(timeout=10)
        check("... and exits with status 0 after exit", code == 0, code)
    except (OSError, subprocess.TimeoutExpired, ValueError) as e:
        check("the server conversation completed", False, e)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()


if __name__ == "__main__":
    main()
    print(f"helix: {passes} checks ok, {len(failures)} failing")
    sys.exit(1 if failures else 0)
