//! Weather from a CSV file. Filled by the weather work.
