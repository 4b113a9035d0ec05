"""The scan on a Dask distributed cluster (docs/scale.md), chosen by `[cluster] scheduler` or `--cluster`.

This file imports no cluster package: dask, distributed and pyarrow are the optional extra
`cluster`, and a scan without a cluster must neither need nor load them. `open_scan` is the one
place the cluster modules are imported.
"""

from __future__ import annotations

import importlib

from auditor.config import Config
from auditor.errors import ConfigError


def open_scan(config: Config):
    """A `ClusterScan` (auditor/cluster/session.py) connected to the configured cluster."""
    # importlib, not an import statement: the cluster modules import dask at their top, and this
    # package must stay importable where the extra is not installed (docs/scale.md).
    try:
        session = importlib.import_module("auditor.cluster.session")
    except ImportError as exc:
        where = repr(str(config.source)) if config.source else "--cluster"
        raise ConfigError(
            f"{where}: a cluster is configured but the cluster extra is not installed ({exc}); "
            "pip install 'corpus-auditor[cluster]'"
        ) from None
    return session.open_scan(config)
