"""The supports-in-space kind: rigid bodies with six degrees of freedom on mounts, frames and soil.

Its model, scenario tables, study and record.
"""
