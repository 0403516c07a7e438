//! Liquid water properties from IAPWS-IF97 (seuif97). Filled by the storage work.
