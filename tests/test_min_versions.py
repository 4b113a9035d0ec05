"""tools/min_versions.py: the declared floors become the pins of the minimum-versions run."""

from __future__ import annotations

import pytest

from tools.min_versions import floors, main


def test_each_floor_becomes_a_pin():
    # PEP 508 requirement syntax (https://peps.python.org/pep-0508/): extras, several specifiers, markers.
    assert floors(
        [
            "sqlite-utils>=4.0",
            "rank-bm25>=0.2.2,<0.3",
            "pkg[extra] >= 1.2 ; python_version < '3.13'",
            "scipy>=1.11.1",
        ]
    ) == ["sqlite-utils==4.0", "rank-bm25==0.2.2", "pkg[extra]==1.2", "scipy==1.11.1"]


@pytest.mark.parametrize("requirement", ["numpy", "numpy<2", "numpy==1.26"])
def test_a_requirement_without_a_floor_is_refused(requirement):
    with pytest.raises(ValueError, match="no '>=' floor"):
        floors([requirement])


def test_every_declared_dependency_has_a_floor(capsys):
    assert main(["--extras", "test,dev"]) == 0
    pins = capsys.readouterr().out.split()
    assert "sqlite-utils==4.0" in pins  # Database.atomic() first shipped in sqlite-utils 4.0
    assert all("==" in pin for pin in pins) and len(pins) >= 20
