import os
import sys

# Test the plugin from its source folder, installed or not.
sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
