//! Tests of the field module (reference values and their origin beside each check).
