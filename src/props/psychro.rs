//! Humid-air psychrometrics, ASHRAE Handbook—Fundamentals 2017 ch. 1. Filled by the psychrometrics work.
