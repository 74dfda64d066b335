//! Verification: knapsack.
