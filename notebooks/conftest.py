"""nbval runs the study notebooks with their records in a temporary folder.

Records that a person wrote while using the workbook (in ``notebooks/records/``) must not
change what the regression run compares, and the run must not write into the repository.
"""

import os
import tempfile

os.environ.setdefault("WORKBOOK_RECORDS_DIR", tempfile.mkdtemp(prefix="wb-nbval-records-"))
