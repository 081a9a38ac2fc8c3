"""Fuzz every registered file reader (tests/fuzzkit.py): valid files load with the right
values; mutated files load sanely or raise the tool's own one-line error naming the file.

Independent facts used: 1 ft = 0.3048 m (NIST SP 811); SI prefixes (g/cm3 -> kg/m3, mN/m -> N/m).
Budget in the default "ci" profile: about 3,500 generated files for the LAS and project
readers, about 5,500 for the CSV readers (``ReaderCase.light``: fewer per test, they have many
mutations); 20x with SATHEIGHT_FUZZ=long.
"""

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fuzzkit import READERS, fuzz_examples, load_cleanly, write_case

CASES = list(READERS.values())
FULL = [c for c in CASES if not c.light]
LIGHT = [c for c in CASES if c.light]
MUTATIONS = [(c, m) for c in FULL for m in c.mutations]
LIGHT_MUTATIONS = [(c, m) for c in LIGHT for m in c.mutations]
SAME = [(c, m) for c in CASES for m in c.same_values]


@pytest.fixture(scope="module")
def workdir(tmp_path_factory):
    root = tmp_path_factory.mktemp("fuzz")
    for case in CASES:
        (root / case.name).mkdir()
        for name, text in case.support_files.items():
            (root / case.name / name).write_text(text)
    return root


def check_valid_file(case, workdir, data):
    content, expected = data.draw(case.valid, label="valid file")
    path = workdir / case.name / f"valid{case.suffix}"
    write_case(path, content)
    result, error = load_cleanly(case.load, path)
    # README (Bad input): a valid file loads; its values are checked against the generator's
    assert error is None, f"a valid file was refused: {error}"
    case.check_loaded(result)
    case.check_valid(result, expected)


@pytest.mark.parametrize("case", FULL, ids=[c.name for c in FULL])
@settings(max_examples=fuzz_examples(250))
@given(data=st.data())
def test_valid_files_load_with_their_values(case, workdir, data):
    check_valid_file(case, workdir, data)


@pytest.mark.parametrize("case", LIGHT, ids=[c.name for c in LIGHT])
@settings(max_examples=fuzz_examples(150))
@given(data=st.data())
def test_valid_light_files_load_with_their_values(case, workdir, data):
    check_valid_file(case, workdir, data)


@pytest.mark.parametrize("case,mutation", MUTATIONS, ids=[f"{c.name}-{m}" for c, m in MUTATIONS])
@settings(max_examples=fuzz_examples(110))
@given(data=st.data())
def test_mutated_files_load_or_fail_cleanly(case, mutation, workdir, data):
    check_mutated_file(case, mutation, workdir, data)


@pytest.mark.parametrize("case,mutation", LIGHT_MUTATIONS,
                         ids=[f"{c.name}-{m}" for c, m in LIGHT_MUTATIONS])
@settings(max_examples=fuzz_examples(50))
@given(data=st.data())
def test_mutated_light_files_load_or_fail_cleanly(case, mutation, workdir, data):
    check_mutated_file(case, mutation, workdir, data)


def check_mutated_file(case, mutation, workdir, data):
    content, _ = data.draw(case.valid, label="valid file")
    text = content if isinstance(content, str) else content.decode("utf-8")
    text = text.replace("\r\n", "\n")          # mutations work on LF text; "line_ends" varies it
    bad = case.mutations[mutation](text, data)
    path = workdir / case.name / f"mutated{case.suffix}"
    write_case(path, bad)
    result, error = load_cleanly(case.load, path)
    if error is None:
        case.check_loaded(result)


@pytest.mark.parametrize("case,mutation", SAME, ids=[f"{c.name}-{m}" for c, m in SAME])
@settings(max_examples=fuzz_examples(20))
@given(data=st.data())
def test_form_changes_keep_the_values(case, mutation, workdir, data):
    """Line ends, byte-order mark, blanks, letter case: the same values and line numbers."""
    content, expected = data.draw(case.valid, label="valid file")
    text = content if isinstance(content, str) else content.decode("utf-8")
    path = workdir / case.name / f"same{case.suffix}"
    write_case(path, case.same_values[mutation](text, data))
    result, error = load_cleanly(case.load, path)
    # README (Bad input, CSV and LAS files): line ends, BOM, blanks, letter case: same values
    assert error is None, f"a valid file in another form was refused: {error}"
    case.check_loaded(result)
    case.check_valid(result, expected)
