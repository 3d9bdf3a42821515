"""Tallgrass Robotics house rules for packwarden (an invented company; an example team package)."""
