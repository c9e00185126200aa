"""The scikit-learn reference of `npm run bench:evasion`: TF-IDF + LogisticRegression trained
on the same clean rows as Sluice, scored on every perturbed copy of the test part.

Run by scripts/bench/evasion.ts with Debian's /usr/bin/python3 (python3-sklearn, installed by
`npm run bench:setup`):

    /usr/bin/python3 scripts/bench/sklearn_evasion.py TRAIN.jsonl OPTIONS.json VARIANT.jsonl...

OPTIONS.json: {"targets": [{"label": "spam", "precision": 0.99}, {"label": "abusive", "recall": 0.9}]},
the policy targets Sluice's build is given. C is chosen from 1, 10, 100 on a validation split
carved from train by group (the rule of sklearn_suite.py), by accuracy; each target's threshold
on the label's probability is chosen on the same split as Sluice chooses its own: the lowest
threshold whose precision reaches the target, or the highest whose recall does. The model is
then refit on all of train. Features: word 1-2-grams, sublinear TF, min_df=2. Prints one JSON
object: the chosen C, the thresholds, and per variant file the predicted labels and, per
target label, which texts reach its threshold.
"""

import hashlib
import json
import sys

import numpy
import sklearn
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.linear_model import LogisticRegression
from sklearn.pipeline import make_pipeline

from jsonl_examples import read_jsonl


def in_validation(group):
    digest = hashlib.sha256(f"sluice-bench-validation-v1:{group}".encode("utf-8")).digest()
    return int.from_bytes(digest[:4], "big") < 0.2 * 2**32


def make_model(c):
    return make_pipeline(TfidfVectorizer(ngram_range=(1, 2), sublinear_tf=True, min_df=2), LogisticRegression(C=c, max_iter=1000))


def choose_threshold(scores, positive, target):
    order = numpy.argsort(-scores)
    ranked, hits = scores[order], positive[order]
    true_positives = numpy.cumsum(hits)
    flagged = numpy.arange(1, len(ranked) + 1)
    total = max(1, int(hits.sum()))
    if "precision" in target:
        ok = [i for i in range(len(ranked)) if true_positives[i] / flagged[i] >= target["precision"]]
        return float(ranked[max(ok)]) if ok else 1.01
    ok = [i for i in range(len(ranked)) if true_positives[i] / total >= target["recall"]]
    return float(ranked[min(ok)]) if ok else 0.0


def main():
    if len(sys.argv) < 4:
        sys.exit("usage: sklearn_evasion.py TRAIN.jsonl OPTIONS.json VARIANT.jsonl...")
    with open(sys.argv[2], encoding="utf-8") as handle:
        targets = json.load(handle)["targets"]
    texts, labels, groups = read_jsonl(sys.argv[1])
    y = numpy.array(labels, dtype=object)
    held = numpy.array([in_validation(g) for g in groups])
    fit_texts = [t for t, h in zip(texts, held) if not h]
    validation_texts = [t for t, h in zip(texts, held) if h]
    best = None
    for c in [1.0, 10.0, 100.0]:
        model = make_model(c).fit(fit_texts, y[~held])
        accuracy = float((model.predict(validation_texts) == y[held]).mean())
        if best is None or accuracy > best[1]:
            best = (c, accuracy, model)
    c, _, model = best
    classes = list(model.classes_)
    probabilities = model.predict_proba(validation_texts)
    thresholds = {}
    for target in targets:
        column = classes.index(target["label"])
        thresholds[target["label"]] = choose_threshold(probabilities[:, column], y[held] == target["label"], target)
    model = make_model(c).fit(texts, y)
    variants = {}
    for path in sys.argv[3:]:
        variant_texts, _, _ = read_jsonl(path)
        probabilities = model.predict_proba(variant_texts)
        variants[path] = {
            "predictions": [classes[i] for i in probabilities.argmax(axis=1)],
            "flagged": {label: (probabilities[:, classes.index(label)] >= t).tolist() for label, t in thresholds.items()},
        }
        print(f"  scikit-learn scored {path}", file=sys.stderr, flush=True)
    json.dump({"C": c, "thresholds": thresholds, "sklearn": sklearn.__version__, "variants": variants}, sys.stdout)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
