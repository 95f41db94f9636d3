#!/usr/bin/env python3
"""Re-run every command shown in README.md and docs/*.md and put what it prints under it.

A shown example is a ```text or ```console block whose lines starting with `$ ` are commands;
the lines after each command, up to the next command or the end of the block, are what it
printed (standard output and standard error together), and a last line `[exit N]`, where an
example shows one, its exit status. `gearsieve` in a command runs the release binary built from
this checkout (into $CARGO_TARGET_DIR when it is set).

    scripts/refresh-docs.py           # rewrite the examples in place
    scripts/refresh-docs.py --check   # exit 1 and name each example that no longer matches
"""

import glob
import os
import re
import subprocess
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
MARK = "\x1e--gearsieve-example--"
STATUS = "\x1f--gearsieve-status--"


def run_block(commands, binary):
    """Run the commands of one block in one shell; return what each printed."""
    script = [f'gearsieve() {{ "{binary}" "$@"; }}', "status=0"]
    for c in commands:
        # `echo $?` in an example means the status of the command before it, not the mark's.
        script.append(f"printf '%s\\n' '{MARK}'; (exit $status)")
        script.append(f"{c} 2>&1; status=$?; printf '%s %d\\n' '{STATUS}' $status")
    out = subprocess.run(
        ["bash", "-c", "\n".join(script)], cwd=ROOT, capture_output=True, text=True, check=False
    ).stdout
    printed = []
    for part in out.split(MARK + "\n")[1:]:
        text, _, status = part.rpartition(STATUS + " ")
        lines = text.rstrip("\n").split("\n") if text.strip("\n") else []
        printed.append((lines, int(status.strip() or 0)))
    return printed


def refresh(path, binary):
    """The file's text with every example re-run, and the examples that changed."""
    lines = open(path, encoding="utf-8").read().split("\n")
    out, changed, i = [], [], 0
    while i < len(lines):
        line = lines[i]
        out.append(line)
        i += 1
        if line.strip() not in ("```text", "```console") or i >= len(lines) or not lines[i].startswith("$ "):
            continue
        end = i
        while end < len(lines) and lines[end].strip() != "```":
            end += 1
        block = lines[i:end]
        commands = [l[2:] for l in block if l.startswith("$ ")]
        shows_status = any(re.fullmatch(r"\[exit \d+\]", l) for l in block)
        fresh = []
        for c, (p, status) in zip(commands, run_block(commands, binary)):
            fresh.append("$ " + c)
            fresh.extend(p)
            if shows_status:
                fresh.append(f"[exit {status}]")
        if fresh != block:
            changed.append(f"{os.path.relpath(path, ROOT)}:{i + 1}: {commands[0]}")
        out.extend(fresh)
        i = end
    return "\n".join(out), changed


def main():
    check = "--check" in sys.argv[1:]
    subprocess.run(["cargo", "build", "--release", "--locked", "--quiet"], cwd=ROOT, check=True)
    # Cargo builds where CARGO_TARGET_DIR says (relative to the checkout), ./target by default.
    target = os.path.join(ROOT, os.environ.get("CARGO_TARGET_DIR") or "target")
    binary = os.path.join(target, "release", "gearsieve")
    all_changed = []
    for path in [os.path.join(ROOT, "README.md")] + sorted(glob.glob(os.path.join(ROOT, "docs", "*.md"))):
        text, changed = refresh(path, binary)
        all_changed += changed
        if changed and not check:
            open(path, "w", encoding="utf-8").write(text)
    for c in all_changed:
        print(("differs: " if check else "refreshed: ") + c)
    if check and all_changed:
        sys.exit(1)
    print(f"{len(all_changed)} example(s) {'differ' if check else 'refreshed'}")


if __name__ == "__main__":
    main()
