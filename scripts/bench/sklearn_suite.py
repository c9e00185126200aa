"""Tuned general-purpose linear references for `npm run bench:accuracy` (scikit-learn).

Run by scripts/bench/accuracy.ts with Debian's /usr/bin/python3 (package python3-sklearn,
installed by `npm run bench:setup`):

    /usr/bin/python3 scripts/bench/sklearn_suite.py TRAIN.jsonl TEST.jsonl OPTIONS.json

Each line is {"text": ..., "label": str or [str, ...], "group": ...}. OPTIONS.json:
{"multiLabel": bool, "charGrams": bool}. For each of TF-IDF + LogisticRegression, LinearSVC
and MultinomialNB, C (or alpha) is chosen on a validation split carved from train by group
(a group is in validation when the first four bytes of sha256("sluice-bench-validation-v1:"
+ group) are below 0.2 * 2^32; the same rule as the corpora's test split, another salt),
scored by accuracy (micro-F1 for multi-label), then the model is refit on all of train and
predicts test. Features: word 1-2-grams (sublinear TF, min_df=2), plus char_wb 1-4-grams when
charGrams is set (language identification). Multi-label: one binary model per label
(OneVsRestClassifier). Prints one JSON object: per model, the chosen value, the validation
scores of every value tried, the final fit seconds, the search seconds and the test predictions
(the caller scores every system with the same code).
"""

import hashlib
import json
import platform
import sys
import time

import numpy
import sklearn
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.linear_model import LogisticRegression
from sklearn.metrics import accuracy_score, f1_score
from sklearn.multiclass import OneVsRestClassifier
from sklearn.naive_bayes import MultinomialNB
from sklearn.pipeline import make_pipeline, make_union
from sklearn.preprocessing import MultiLabelBinarizer
from sklearn.svm import LinearSVC

from jsonl_examples import read_jsonl

GRIDS = {
    "LogisticRegression": ("C", [1.0, 10.0, 100.0]),
    "LinearSVC": ("C", [0.1, 1.0, 10.0]),
    "MultinomialNB": ("alpha", [0.01, 0.1, 1.0]),
}


def in_validation(group):
    digest = hashlib.sha256(f"sluice-bench-validation-v1:{group}".encode("utf-8")).digest()
    return int.from_bytes(digest[:4], "big") < 0.2 * 2**32


def make_model(name, value, options):
    word = TfidfVectorizer(ngram_range=(1, 2), sublinear_tf=True, min_df=2)
    features = make_union(word, TfidfVectorizer(analyzer="char_wb", ngram_range=(1, 4), sublinear_tf=True, min_df=2)) if options["charGrams"] else word
    if name == "LogisticRegression":
        learner = LogisticRegression(C=value, max_iter=1000)
    elif name == "LinearSVC":
        learner = LinearSVC(C=value)
    else:
        learner = MultinomialNB(alpha=value)
    if options["multiLabel"]:
        learner = OneVsRestClassifier(learner)
    return make_pipeline(features, learner)


def score(gold, predicted, multi_label):
    return f1_score(gold, predicted, average="micro", zero_division=0) if multi_label else accuracy_score(gold, predicted)


def main():
    if len(sys.argv) != 4:
        sys.exit("usage: sklearn_suite.py TRAIN.jsonl TEST.jsonl OPTIONS.json")
    with open(sys.argv[3], encoding="utf-8") as handle:
        options = {"multiLabel": False, "charGrams": False, **json.load(handle)}
    train_texts, train_labels, train_groups = read_jsonl(sys.argv[1])
    test_texts, _, _ = read_jsonl(sys.argv[2])
    multi_label = options["multiLabel"]
    binarizer = MultiLabelBinarizer() if multi_label else None
    y = binarizer.fit_transform(train_labels) if multi_label else numpy.array(train_labels, dtype=object)
    held = numpy.array([in_validation(g) for g in train_groups])
    fit_texts = [t for t, h in zip(train_texts, held) if not h]
    validation_texts = [t for t, h in zip(train_texts, held) if h]
    results = []
    for name, (parameter, values) in GRIDS.items():
        started = time.perf_counter()
        tried = []
        for value in values:
            model = make_model(name, value, options)
            model.fit(fit_texts, y[~held])
            tried.append({"value": value, "validation": score(y[held], model.predict(validation_texts), multi_label)})
        best = max(tried, key=lambda t: t["validation"])
        search_seconds = time.perf_counter() - started
        model = make_model(name, best["value"], options)
        started = time.perf_counter()
        model.fit(train_texts, y)
        fit_seconds = time.perf_counter() - started
        predicted = model.predict(test_texts)
        predictions = [list(row) for row in binarizer.inverse_transform(predicted)] if multi_label else [str(p) for p in predicted]
        results.append({
            "name": name,
            "parameter": parameter,
            "value": best["value"],
            "tried": tried,
            "validationRows": int(held.sum()),
            "searchSeconds": search_seconds,
            "fitSeconds": fit_seconds,
            "predictions": predictions,
        })
        print(f"  {name} {parameter}={best['value']} fit {fit_seconds:.1f} s (search {search_seconds:.1f} s)", file=sys.stderr, flush=True)
    json.dump({"models": results, "sklearn": sklearn.__version__, "python": platform.python_version()}, sys.stdout)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
