"""Pure emulsion calculations. See README.md in this folder for the rule."""
