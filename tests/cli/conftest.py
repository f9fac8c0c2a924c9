"""Test stations shared by the command's tests."""
import pytest


@pytest.fixture
def doublet(data_path):
    """A doublet on window line behind a balanced tuner; its compare: key lists three cables and
    the tuner positions."""
    return data_path("orchard-doublet.yaml")


@pytest.fixture
def dipole(data_path):
    """A dipole on coax, with no tuner and no compare: key."""
    return data_path("hilltop-dipole.yaml")
