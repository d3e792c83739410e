"""The review app's screens: article list, review, edit form, reject, row/column accept, help."""
