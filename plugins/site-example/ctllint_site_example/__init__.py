"""An example site plugin for ctllint: the house rules of an invented plant."""
