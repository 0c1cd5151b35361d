"""nbval runs the study notebooks with their records in a temporary folder.

Records that a person wrote while using the workbook (in ``notebooks/records/``) must not
change what the regression run compares, and the run must not write into the repository.
"""

import os
import tempfile

# always a fresh folder (not setdefault): a records folder set by the caller may hold records
# that would reopen the studies with other values than the committed outputs
os.environ["WORKBOOK_RECORDS_DIR"] = tempfile.mkdtemp(prefix="wb-nbval-records-")
