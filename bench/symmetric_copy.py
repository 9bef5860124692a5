#!/usr/bin/env python3
"""Copy a folder of .syz files with every asymmetric uncertainty `+a/-b` replaced by the
mean of its two sides, `± (a+b)/2`: the catalogue as the peer scripts read it.

Usage: python3 bench/symmetric_copy.py SRC_DIR DEST_DIR
"""
import os
import re
import sys


def main():
    src, dest = sys.argv[1], sys.argv[2]
    os.makedirs(dest, exist_ok=True)
    pattern = re.compile(r"\+([0-9.]+)/-([0-9.]+)")
    for name in sorted(os.listdir(src)):
        if not name.endswith(".syz"):
            continue
        with open(os.path.join(src, name), encoding="utf-8") as f:
            text = f.read()
        text = pattern.sub(
            lambda m: "± %.5f" % ((float(m.group(1)) + float(m.group(2))) / 2), text
        )
        with open(os.path.join(dest, name), "w", encoding="utf-8") as f:
            f.write(text)


if __name__ == "__main__":
    main()
