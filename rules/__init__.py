"""packwarden's built-in rules, one module per rule.

Installed as ``packwarden_rules`` and registered through the ``packwarden.rules`` entry-point group,
exactly as a team's rule package would be. Rules import only the public ``packwarden`` API.
"""
