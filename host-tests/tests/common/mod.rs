//! Proptest strategies for the core's report records, shared by the protocol tests and
//! the capture tool's tests (each includes this file with `mod common;`).
#![allow(dead_code)]

use feedline::report::record::{GAMMA_MICRO_MAX, RL_CDB_MAX, VSWR_MILLI_MAX};
use feedline::report::{
    DeviceState, MonitorFlags, MonitorRecord, Record, StatusRecord, SweepPointRecord,
};
use proptest::prelude::*;

/// Any valid monitor record.
pub fn monitor() -> impl Strategy<Value = MonitorRecord> {
    (
        any::<u32>(),
        any::<u32>(),
        any::<u32>(),
        any::<u32>(),
        any::<u32>(),
        1000u32..=VSWR_MILLI_MAX,
        0u16..=RL_CDB_MAX,
        0u8..=MonitorFlags::ALL,
    )
        .prop_map(|(seq, t, f, r, d, v, rl, fl)| MonitorRecord {
            seq,
            time_ms: t,
            forward_mw: f,
            reflected_mw: r,
            delivered_mw: d,
            vswr_milli: v,
            return_loss_cdb: rl,
            flags: MonitorFlags::from_bits(fl).unwrap(),
        })
}

/// Any valid sweep point.
pub fn point() -> impl Strategy<Value = SweepPointRecord> {
    (
        any::<u16>(),
        1u16..=u16::MAX,
        any::<u64>(),
        -GAMMA_MICRO_MAX..=GAMMA_MICRO_MAX,
        -GAMMA_MICRO_MAX..=GAMMA_MICRO_MAX,
    )
        .prop_flat_map(|(sweep, count, f, re, im)| {
            (0..count).prop_map(move |index| SweepPointRecord {
                sweep,
                index,
                count,
                freq_hz: f,
                gamma_re_micro: re,
                gamma_im_micro: im,
            })
        })
}

/// Any valid status record.
pub fn status() -> impl Strategy<Value = StatusRecord> {
    (
        any::<u32>(),
        prop_oneof![
            Just(DeviceState::Idle),
            Just(DeviceState::Monitoring),
            Just(DeviceState::Sweeping),
            Just(DeviceState::Calibrating)
        ],
        any::<bool>(),
        any::<bool>(),
        any::<u16>(),
    )
        .prop_map(|(up, state, locked, cal, errs)| StatusRecord {
            uptime_s: up,
            state,
            locked,
            cal_valid: cal,
            rx_errors: errs,
        })
}

/// Any valid record.
pub fn record() -> impl Strategy<Value = Record> {
    prop_oneof![
        monitor().prop_map(Record::Monitor),
        point().prop_map(Record::SweepPoint),
        status().prop_map(Record::Status),
    ]
}
