//! placeholder
#![no_std]
