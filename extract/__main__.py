"""`python -m extract` runs the winnow command line."""

from extract.cli import main

if __name__ == "__main__":
    main()
