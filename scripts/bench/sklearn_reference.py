"""The strong linear reference for `npm run bench`: TF-IDF + logistic regression (scikit-learn;
the learner is defined once, in sklearn_learners.py, with the suite's).

Run by scripts/bench/comparison.ts with Debian's /usr/bin/python3 (package python3-sklearn,
installed by `npm run bench:setup`; the bench installs nothing itself):

    /usr/bin/python3 scripts/bench/sklearn_reference.py TRAIN.jsonl TEST.jsonl [OPTIONS.json]

Each input line is {"text": ..., "label": ...}. Prints one JSON object on stdout:
train seconds, predictions for every test text (the caller computes accuracy and macro-F1
with Sluice's own metric code, so every system is scored the same way), sklearn's own
accuracy and macro-F1 as a cross-check, per-call and batch microseconds per text, the model
size, and the time to load the pickled pipeline.

Model size, as stated in the benchmark: the vocabulary (sum of the UTF-8 byte lengths of the
terms + 4 bytes per term index) plus the coefficients (8 bytes, float64, per entry of coef_
and intercept_; for two classes scikit-learn keeps one coefficient row, not two). The idf_
vector (8 bytes per term) is needed to predict too; it is reported separately, not added.
"""

import json
import pickle
import platform
import statistics
import sys
import time

import sklearn
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.metrics import accuracy_score, f1_score
from sklearn.pipeline import make_pipeline

from jsonl_examples import read_jsonl
from sklearn_learners import iterations_of, make_learner


def percentile(sorted_values, fraction):
    """Nearest-rank percentile of an ascending list (the same rule as comparison.ts)."""
    rank = max(1, int(-(-fraction * len(sorted_values) // 1)))
    return sorted_values[min(rank, len(sorted_values)) - 1]


def main():
    if len(sys.argv) < 3:
        sys.exit("usage: sklearn_reference.py TRAIN.jsonl TEST.jsonl [OPTIONS.json]")
    options = {"C": 10.0, "singleSample": 500, "warmup": 20, "loadRepeats": 20}
    if len(sys.argv) > 3:
        with open(sys.argv[3], encoding="utf-8") as handle:
            options.update(json.load(handle))
    train_texts, train_labels, _ = read_jsonl(sys.argv[1])
    test_texts, test_labels, _ = read_jsonl(sys.argv[2])

    pipeline = make_pipeline(
        TfidfVectorizer(ngram_range=(1, 2), sublinear_tf=True, min_df=2),
        make_learner("LogisticRegression", options["C"]),
    )
    started = time.perf_counter()
    pipeline.fit(train_texts, train_labels)
    train_seconds = time.perf_counter() - started

    started = time.perf_counter()
    predictions = pipeline.predict(test_texts).tolist()
    batch_us_per_doc = (time.perf_counter() - started) * 1e6 / max(1, len(test_texts))

    # Single-text calls, as an online service would make them, on an evenly spread sample.
    sample_size = min(options["singleSample"], len(test_texts))
    step = len(test_texts) / sample_size
    sample = [test_texts[int(i * step)] for i in range(sample_size)]
    for text in sample[: options["warmup"]]:
        pipeline.predict([text])
    single = []
    for text in sample:
        started = time.perf_counter()
        pipeline.predict([text])
        single.append((time.perf_counter() - started) * 1e6)
    single.sort()

    vectorizer, model = pipeline.steps[0][1], pipeline.steps[1][1]
    vocabulary = vectorizer.vocabulary_
    vocabulary_bytes = sum(len(term.encode("utf-8")) for term in vocabulary) + 4 * len(vocabulary)
    coefficient_bytes = 8 * (model.coef_.size + model.intercept_.size)

    pickled = pickle.dumps(pipeline)
    load_ms = []
    for _ in range(options["loadRepeats"]):
        started = time.perf_counter()
        pickle.loads(pickled)
        load_ms.append((time.perf_counter() - started) * 1e3)

    json.dump(
        {
            "trainSeconds": train_seconds,
            "predictions": predictions,
            "accuracy": accuracy_score(test_labels, predictions),
            "macroF1": f1_score(test_labels, predictions, average="macro"),
            "batchUsPerDoc": batch_us_per_doc,
            "singleCalls": len(single),
            "singleUsP50": percentile(single, 0.5),
            "singleUsP99": percentile(single, 0.99),
            "features": len(vocabulary),
            "coefficientRows": int(model.coef_.shape[0]),
            "classes": [str(c) for c in model.classes_],
            "vocabularyBytes": vocabulary_bytes,
            "coefficientBytes": coefficient_bytes,
            "modelBytes": vocabulary_bytes + coefficient_bytes,
            "idfBytes": 8 * len(vocabulary),
            "pickleBytes": len(pickled),
            "loadMs": statistics.median(load_ms),
            "C": options["C"],
            "iterations": iterations_of(model),
            "solver": model.solver,
            "sklearn": sklearn.__version__,
            "python": platform.python_version(),
        },
        sys.stdout,
    )
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
