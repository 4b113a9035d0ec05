"""Measures of how well a score separates two groups, shared by calibration and the corpus probe."""

from __future__ import annotations


def roc_auc(positives: list[float], negatives: list[float]) -> float:
    """P(score of a random positive > score of a random negative), ties counting one half.

    This is the Mann–Whitney U statistic over n₁·n₀ (Hanley & McNeil, Radiology 1982).
    """
    if not positives or not negatives:
        raise ValueError("ROC AUC needs at least one positive and one negative")
    ordered = sorted([(s, 1) for s in positives] + [(s, 0) for s in negatives])
    # Average ranks over ties, then U = R₁ − n₁(n₁+1)/2.
    rank_sum, i = 0.0, 0
    while i < len(ordered):
        j = i
        while j + 1 < len(ordered) and ordered[j + 1][0] == ordered[i][0]:
            j += 1
        average = (i + j) / 2 + 1
        rank_sum += average * sum(1 for k in range(i, j + 1) if ordered[k][1] == 1)
        i = j + 1
    n1, n0 = len(positives), len(negatives)
    return (rank_sum - n1 * (n1 + 1) / 2) / (n1 * n0)
