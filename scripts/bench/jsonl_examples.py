"""Reads labelled examples from a JSONL file for the scikit-learn reference scripts.

One object a line with "text", "label" and an optional "group" (a row without one is its own
group); blank lines are skipped, and a bad line stops with the file and line number.
"""

import json
import sys


def read_jsonl(path):
    texts, labels, groups = [], [], []
    with open(path, encoding="utf-8") as handle:
        for number, line in enumerate(handle, start=1):
            if not line.strip():
                continue
            try:
                record = json.loads(line)
                texts.append(record["text"])
                labels.append(record["label"])
                groups.append(str(record.get("group", number)))
            except (ValueError, KeyError) as error:
                sys.exit(f"{path}, line {number}: expected a JSON object with \"text\" and \"label\" ({error})")
    return texts, labels, groups
