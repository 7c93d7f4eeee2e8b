"""Fixture for HierarchicalClusteringTest: average-linkage clusters from scipy.

A correlation matrix with clear blocks is generated from simulated returns (5 blocks of sizes
6, 4, 5, 3, 1 driven by block factors of different strength, plus a common market factor), then
scipy.cluster.hierarchy.linkage(squareform(1 - rho), method="average") and
fcluster(Z, t=1 - threshold, criterion="distance") give the flat clusters for several thresholds.
A second case blanks a few correlations (most inside two blocks) (null in the JSON, NaN for Winnow) and gives scipy distance 1
for them, which is Winnow's documented convention for a missing correlation.

Rerun from the repository root with Debian's python3-scipy:
    /usr/bin/python3 service/src/test/scripts/clustering_fixture.py
Writes service/src/test/resources/fixtures/clustering.json.
"""
import json
from pathlib import Path

import numpy as np
from scipy.cluster.hierarchy import fcluster, linkage
from scipy.spatial.distance import squareform

OUT = Path(__file__).resolve().parent.parent / "resources" / "fixtures" / "clustering.json"
THRESHOLDS = [0.2, 0.4, 0.5, 0.6, 0.8]

rng = np.random.default_rng(3)
sizes, strengths = [6, 4, 5, 3, 1], [1.6, 1.2, 1.0, 0.8, 0.0]
T = 400
market = rng.normal(size=T)
series = []
for size, strength in zip(sizes, strengths):
    block = rng.normal(size=T)
    for _ in range(size):
        series.append(0.4 * market + strength * block + rng.normal(size=T))
order = rng.permutation(len(series))
rho = np.corrcoef(np.array(series)[order])
np.fill_diagonal(rho, 1.0)


def scipy_labels(distance):
    z = linkage(squareform(distance, checks=False), method="average")
    return {str(t): fcluster(z, t=1 - t, criterion="distance").tolist() for t in THRESHOLDS}


def as_json(matrix):
    return [[None if np.isnan(v) else float(v) for v in row] for row in matrix]


distance = 1 - rho
np.fill_diagonal(distance, 0.0)

blanked = rho.copy()
position = np.argsort(order)  # position[original index] = row in the shuffled matrix
block_of_four = position[6:10]
block_of_three = position[15:18]
for i, j in [(block_of_four[0], block_of_four[1]), (block_of_four[0], block_of_four[2]),
             (block_of_three[0], block_of_three[1]), (block_of_three[0], block_of_three[2]), (0, 1)]:
    blanked[i, j] = blanked[j, i] = np.nan
blanked_distance = np.where(np.isnan(blanked), 1.0, 1 - blanked)
np.fill_diagonal(blanked_distance, 0.0)

payload = {
    "thresholds": THRESHOLDS,
    "cases": [
        {"name": "blocks", "correlation": as_json(rho), "scipy_labels": scipy_labels(distance)},
        {"name": "blocks with missing correlations", "correlation": as_json(blanked),
         "scipy_labels": scipy_labels(blanked_distance)},
    ],
}
OUT.write_text(json.dumps(payload) + "\n")
print("wrote", OUT)
for case in payload["cases"]:
    for t, labels in case["scipy_labels"].items():
        print(case["name"], t, len(set(labels)), labels)
