//! Sweeps, corners, Monte Carlo, sensitivity, tempco, trim, noise and fits (later issues).
