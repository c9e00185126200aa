"""Tuned general-purpose linear references for `npm run bench:accuracy` (scikit-learn).

Run by scripts/bench/accuracy.ts with Debian's /usr/bin/python3 (package python3-sklearn,
installed by `npm run bench:setup`):

    /usr/bin/python3 scripts/bench/sklearn_suite.py TRAIN.jsonl TEST.jsonl OPTIONS.json

Each line is {"text": ..., "label": str or [str, ...], "group": ...}. OPTIONS.json:
{"multiLabel": bool, "charGrams": bool, "only": [names] (optional)}. For each of TF-IDF +
LogisticRegression, LinearSVC and MultinomialNB (learners in sklearn_learners.py), C (or
alpha) is chosen from a small grid (extended past its edge while the best value lies on it)
on a validation split carved from train by group (a group is in validation
when the first four bytes of sha256("sluice-bench-validation-v1:" + group) are below
0.2 * 2^32; the same rule as the corpora's test split, another salt), scored by accuracy
(micro-F1 for multi-label), then the model is refit on all of train and predicts test.
Features: word 1-2-grams (sublinear TF, min_df=2), plus char_wb 1-4-grams when charGrams is
set (language identification). Multi-label: one binary model per label (OneVsRestClassifier).

The grid search vectorizes the fit part and the validation part once and fits every value on
the same matrices; LogisticRegression walks its grid from the smallest C up, each fit starting
from the previous coefficients (warm start: the same convex problem's solution, reached in
fewer epochs). The final fit is the whole pipeline (vectorizer + learner) on all of train,
timed as fitSeconds. Prints one JSON object: per model, the chosen value, every value tried
with its validation score, seconds and iterations, the final fit seconds, the search seconds
and the test predictions (the caller scores every system with the same code).
"""

import hashlib
import json
import platform
import sys
import time
import warnings

import numpy
import scipy
import sklearn
from sklearn.exceptions import ConvergenceWarning
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.metrics import accuracy_score, f1_score
from sklearn.multiclass import OneVsRestClassifier
from sklearn.pipeline import make_pipeline, make_union
from sklearn.preprocessing import MultiLabelBinarizer

from jsonl_examples import read_jsonl
from sklearn_learners import iterations_of, make_learner

GRIDS = {
    "LogisticRegression": ("C", [1.0, 10.0, 100.0]),
    "LinearSVC": ("C", [0.1, 1.0, 10.0]),
    "MultinomialNB": ("alpha", [0.01, 0.1, 1.0]),
}
# A best value on the grid's edge is not a tuned one: the grid grows by a factor of 10 past
# that edge up to this many times.
EDGE_STEPS = 2
# saga's epochs grow with C, and above C = 1000 LogisticRegression is all but unregularised: on
# the package-sections validation split C = 100 / 1000 / 10000 scored 0.7355 / 0.7378 / 0.7391
# in 73 / 224 / 91 s (warm-started), so its grid stops at 1000.
# Multi-label (one binary saga fit per label, no warm start) is slower still: on package-tags
# C = 100 ran 300 epochs without converging (419 s) and C = 1000 had not finished after 10 min.
LARGEST = {"LogisticRegression": 1000.0}
LARGEST_MULTI_LABEL = {"LogisticRegression": 100.0}


def in_validation(group):
    digest = hashlib.sha256(f"sluice-bench-validation-v1:{group}".encode("utf-8")).digest()
    return int.from_bytes(digest[:4], "big") < 0.2 * 2**32


def make_features(options):
    word = TfidfVectorizer(ngram_range=(1, 2), sublinear_tf=True, min_df=2, dtype=numpy.float32)
    if not options["charGrams"]:
        return word
    return make_union(word, TfidfVectorizer(analyzer="char_wb", ngram_range=(1, 4), sublinear_tf=True, min_df=2, dtype=numpy.float32))


def wrap(learner, options):
    return OneVsRestClassifier(learner) if options["multiLabel"] else learner


def score(gold, predicted, multi_label):
    return f1_score(gold, predicted, average="micro", zero_division=0) if multi_label else accuracy_score(gold, predicted)


def log(message):
    print(message, file=sys.stderr, flush=True)


def fit_and_score(name, value, learner, fit_matrix, fit_y, validation_matrix, validation_y, options):
    started = time.perf_counter()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ConvergenceWarning)
        learner.fit(fit_matrix, fit_y)
    seconds = time.perf_counter() - started
    validation = score(validation_y, learner.predict(validation_matrix), options["multiLabel"])
    converged = not any(issubclass(w.category, ConvergenceWarning) for w in caught)
    iterations = iterations_of(learner)
    log(f"    {name} {value}: validation {validation:.4f} in {seconds:.1f} s ({iterations} iterations{'' if converged else ', not converged'})")
    return {"value": value, "validation": validation, "seconds": seconds, "iterations": iterations, "converged": converged}


def search(name, values, fit_matrix, fit_y, validation_matrix, validation_y, options):
    """Every value of the grid fit on the same matrices, the grid extended by a factor of 10 (at most
    EDGE_STEPS times) while the best value lies on its edge; LogisticRegression warm-starts up its grid."""
    warm = name == "LogisticRegression" and not options["multiLabel"]
    learner = make_learner(name, values[0], warm_start=True) if warm else None

    def fit(value):
        nonlocal learner
        if warm:
            learner.set_params(C=value)
        else:
            learner = wrap(make_learner(name, value), options)
        return fit_and_score(name, value, learner, fit_matrix, fit_y, validation_matrix, validation_y, options)

    tried = [fit(value) for value in sorted(values)]
    for _ in range(EDGE_STEPS):
        best = max(tried, key=lambda t: t["validation"])
        values_tried = sorted(t["value"] for t in tried)
        if best["value"] == values_tried[-1]:
            largest = (LARGEST_MULTI_LABEL if options["multiLabel"] else LARGEST).get(name, float("inf"))
            if values_tried[-1] * 10 > largest:
                break
            tried.append(fit(values_tried[-1] * 10))
        elif best["value"] == values_tried[0] and not warm:
            # A warm start walks up only; below the grid, LogisticRegression starts afresh.
            tried.append(fit(values_tried[0] / 10))
        elif best["value"] == values_tried[0]:
            learner = make_learner(name, values_tried[0] / 10, warm_start=True)
            tried.append(fit(values_tried[0] / 10))
        else:
            break
    return tried


def main():
    if len(sys.argv) != 4:
        sys.exit("usage: sklearn_suite.py TRAIN.jsonl TEST.jsonl OPTIONS.json")
    with open(sys.argv[3], encoding="utf-8") as handle:
        options = {"multiLabel": False, "charGrams": False, "only": None, **json.load(handle)}
    train_texts, train_labels, train_groups = read_jsonl(sys.argv[1])
    test_texts, _, _ = read_jsonl(sys.argv[2])
    multi_label = options["multiLabel"]
    binarizer = MultiLabelBinarizer() if multi_label else None
    y = binarizer.fit_transform(train_labels) if multi_label else numpy.array(train_labels, dtype=object)
    held = numpy.array([in_validation(g) for g in train_groups])
    fit_texts = [t for t, h in zip(train_texts, held) if not h]
    validation_texts = [t for t, h in zip(train_texts, held) if h]

    started = time.perf_counter()
    features = make_features(options)
    fit_matrix = features.fit_transform(fit_texts)
    validation_matrix = features.transform(validation_texts)
    vectorize_seconds = time.perf_counter() - started
    log(f"  validation split: {fit_matrix.shape[0]} fit / {validation_matrix.shape[0]} validation rows, {fit_matrix.shape[1]} features ({fit_matrix.nnz} non-zeros), vectorized in {vectorize_seconds:.1f} s")

    results = []
    for name, (parameter, values) in GRIDS.items():
        if options["only"] and name not in options["only"]:
            continue
        started = time.perf_counter()
        tried = search(name, values, fit_matrix, y[~held], validation_matrix, y[held], options)
        best = max(tried, key=lambda t: t["validation"])
        search_seconds = time.perf_counter() - started + vectorize_seconds
        model = make_pipeline(make_features(options), wrap(make_learner(name, best["value"]), options))
        started = time.perf_counter()
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always", ConvergenceWarning)
            model.fit(train_texts, y)
        fit_seconds = time.perf_counter() - started
        converged = not any(issubclass(w.category, ConvergenceWarning) for w in caught)
        predicted = model.predict(test_texts)
        predictions = [list(row) for row in binarizer.inverse_transform(predicted)] if multi_label else [str(p) for p in predicted]
        results.append({
            "name": name,
            "parameter": parameter,
            "value": best["value"],
            "tried": tried,
            "validationRows": int(held.sum()),
            "features": int(model.steps[0][1].transform(train_texts[:1]).shape[1]),
            "searchSeconds": search_seconds,
            "fitSeconds": fit_seconds,
            "fitIterations": iterations_of(model.steps[-1][1]),
            "fitConverged": converged,
            "predictions": predictions,
        })
        log(f"  {name} {parameter}={best['value']} fit {fit_seconds:.1f} s (search {search_seconds:.1f} s)")
    json.dump({"models": results, "sklearn": sklearn.__version__, "numpy": numpy.__version__, "scipy": scipy.__version__, "python": platform.python_version()}, sys.stdout)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
