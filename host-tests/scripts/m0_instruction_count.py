#!/usr/bin/env python3
"""Approximate count of the instructions executed per reading by the integer chain on
Armv6-M (Cortex-M0/M0+), by interpreting the compiler's Thumb assembly.

Usage (from the workspace root):

    cargo test -p feedline-host-tests --test fixed_no_float     # writes the assembly
    python3 host-tests/scripts/m0_instruction_count.py \\
        target/fixed-no-float/thumbv6m-none-eabi/release/deps/feedline-*.s

It runs `fixed::LinearChain::measure`, `fixed::SquareLawChain::measure` and
`fixed::log2::log2_q24` on a few inputs in a small interpreter of the Thumb-1 subset that
LLVM emits for them, and prints the instructions executed (not cycles: on a Cortex-M0 most
take one cycle, loads and stores two, taken branches three) with the decoded results, so
that a wrong emulation shows as a wrong |Γ| or return loss.

Limits: it is a measuring aid, not a simulator. It knows the instructions the chain uses
(it stops with NotImplementedError on any other), models memory as a flat byte array with
the assembly's read-only data laid out at made-up addresses, and assumes the field layout
rustc chose for `CodeVerdict` (margin `u32` at offset 0, full scale `u16` at 4, floor
`u16` at 6: read from the assembly; check it after changing that struct). The benchmark
firmware measures the real figure on hardware or a cycle-counting emulator.
"""
import re, sys, struct

def unescape_ascii(s):
    out = bytearray(); i = 0
    while i < len(s):
        c = s[i]
        if c == '\\':
            n = s[i+1]
            if n in '01234567':
                j = i+1; k = ''
                while j < len(s) and len(k) < 3 and s[j] in '01234567': k += s[j]; j += 1
                out.append(int(k, 8)); i = j; continue
            m = {'n': 10, 't': 9, 'r': 13, 'b': 8, 'f': 12, '"': 34, '\\': 92}.get(n)
            if m is None: raise ValueError(n)
            out.append(m); i += 2; continue
        out.append(ord(c)); i += 1
    return bytes(out)

class Prog:
    def __init__(self, path):
        self.lines = open(path).read().split('\n')
        self.funcs = {}   # name -> (ins, labels)
        self.data = {}    # label -> bytes (or list of ('sym', name))
        cur = None; ins = []; labels = {}
        datalabel = None; buf = None
        for raw in self.lines:
            l = raw.split('@')[0].rstrip() if not raw.strip().startswith('.asci') else raw.rstrip()
            t = l.strip()
            if not t: continue
            if cur is not None and t.startswith('.Lfunc_end'):
                self.funcs[cur] = (ins, labels); cur = None; continue
            if t.endswith(':') and not t.startswith('.ascii'):
                name = t[:-1]
                if name.startswith('_ZN') or (cur is None and not name.startswith('.L')):
                    if cur is None and name.startswith('_ZN'):
                        cur = name; ins = []; labels = {}; continue
                if cur is not None:
                    labels[name] = len(ins); continue
                datalabel = name; self.data[name] = []; continue
            if cur is not None and t.startswith('.Lfunc_end'):
                self.funcs[cur] = (ins, labels); cur = None; continue
            if t.startswith('.'):
                d = t.split(None, 1)
                key = datalabel if cur is None else (ins and None)
                target = None
                if cur is not None:
                    # literal pools inside functions: label -> data
                    lastlabel = None
                    for k, v in labels.items():
                        if v == len(ins): lastlabel = k
                    if lastlabel and lastlabel.startswith('.LCPI'):
                        target = lastlabel
                else:
                    target = datalabel
                if target is not None and d[0] in ('.long', '.short', '.byte', '.ascii', '.asciz', '.zero'):
                    self.data.setdefault(target, [])
                    if d[0] == '.long':
                        v = d[1].strip()
                        if re.fullmatch(r'-?\d+', v): self.data[target].append(struct.pack('<i' if v.startswith('-') else '<I', int(v)))
                        else: self.data[target].append(('sym', v))
                    elif d[0] == '.short': self.data[target].append(struct.pack('<H', int(d[1]) & 0xffff))
                    elif d[0] == '.byte': self.data[target].append(struct.pack('<B', int(d[1]) & 0xff))
                    elif d[0] in ('.ascii', '.asciz'):
                        s = d[1].strip()
                        if not (s[0] == "\"" and s[-1] == "\""): print(repr(raw)[:200]); raise SystemExit
                        b = unescape_ascii(s[1:-1]);
                        if d[0] == '.asciz': b += b'\0'
                        self.data[target].append(b)
                    elif d[0] == '.zero': self.data[target].append(bytes(int(d[1].split(',')[0])))
                continue
            if cur is not None: ins.append(t)
        # lay out data
        self.mem = bytearray(1 << 20); self.addr = {}; a = 0x1000
        for k, parts in self.data.items():
            self.addr[k] = a
            for p in parts: a += 4 if isinstance(p, tuple) else len(p)
            a = (a + 3) & ~3
        for k, parts in self.data.items():
            a = self.addr[k]
            for p in parts:
                if isinstance(p, tuple):
                    v = self.addr.get(p[1], 0); self.mem[a:a+4] = struct.pack('<I', v); a += 4
                else:
                    self.mem[a:a+len(p)] = p; a += len(p)

    def find(self, frag):
        c = [n for n in self.funcs if frag in n]
        assert len(c) == 1, (frag, c)
        return c[0]

M = 0xffffffff
class CPU:
    def __init__(self, prog):
        self.p = prog; self.r = [0]*16; self.r[13] = 0xF0000; self.N = self.Z = self.C = self.V = 0
        self.count = 0; self.calls = {}
    def ld(self, a, n): return int.from_bytes(self.p.mem[a:a+n], 'little')
    def stm(self, a, v, n): self.p.mem[a:a+n] = (v & ((1 << 8*n) - 1)).to_bytes(n, 'little')
    def reg(self, s):
        s = s.strip()
        return {'sp': 13, 'lr': 14, 'pc': 15}.get(s, None) if not s.startswith('r') else int(s[1:])
    def val(self, s):
        s = s.strip()
        if s.startswith('#'): return int(s[1:], 0) & M
        return self.r[self.reg(s)]
    def nz(self, v): v &= M; self.N = v >> 31; self.Z = int(v == 0); return v
    def add(self, a, b, c=0):
        res = a + b + c; self.C = int(res > M); r = res & M
        self.V = int(((a ^ r) & (b ^ r)) >> 31 & 1); self.nz(r); return r
    def sub(self, a, b, c=1): return self.add(a, (~b) & M, c)
    def cond(self, cc):
        N, Z, C, V = self.N, self.Z, self.C, self.V
        return {'eq': Z, 'ne': not Z, 'hs': C, 'cs': C, 'lo': not C, 'cc': not C, 'mi': N, 'pl': not N,
                'vs': V, 'vc': not V, 'hi': C and not Z, 'ls': (not C) or Z, 'ge': N == V, 'lt': N != V,
                'gt': (not Z) and N == V, 'le': Z or N != V}[cc]
    def mem_operand(self, s):
        inner = s[s.index('[')+1:s.index(']')].split(',')
        base = self.r[self.reg(inner[0])]
        off = self.val(inner[1]) if len(inner) > 1 else 0
        return (base + off) & M
    def run(self, name, depth=0):
        ins, labels = self.p.funcs[name]
        pc = 0; ret_lr = self.r[14]
        self.per = getattr(self, 'per', {})
        while True:
            t = ins[pc]; self.count += 1; self.per[name] = self.per.get(name, 0) + 1
            op, _, rest = t.partition('\t') if '\t' in t else t.partition(' ')
            op = op.strip(); args = [a.strip() for a in re.split(r',(?![^\[]*\])(?![^{]*})', rest)] if rest else []
            pc += 1
            if op in ('movs', 'mov'):
                v = self.val(args[1]); self.r[self.reg(args[0])] = v
                if op == 'movs': self.nz(v)
            elif op in ('adds', 'add', 'subs', 'sub'):
                if len(args) == 2: a, b = self.val(args[0]), self.val(args[1])
                else: a, b = self.val(args[1]), self.val(args[2])
                if op.startswith('add'):
                    r = self.add(a, b) if op == 'adds' else (a + b) & M
                else:
                    r = self.sub(a, b) if op == 'subs' else (a - b) & M
                self.r[self.reg(args[0])] = r
            elif op == 'adcs': self.r[self.reg(args[0])] = self.add(self.val(args[0]), self.val(args[1]), self.C)
            elif op == 'sbcs': self.r[self.reg(args[0])] = self.sub(self.val(args[0]), self.val(args[1]), self.C)
            elif op == 'rsbs': self.r[self.reg(args[0])] = self.sub(0, self.val(args[1]))
            elif op == 'cmp': self.sub(self.val(args[0]), self.val(args[1]))
            elif op == 'cmn': self.add(self.val(args[0]), self.val(args[1]))
            elif op in ('lsls', 'lsrs', 'asrs'):
                if len(args) == 3: a, n = self.val(args[1]), self.val(args[2])
                else: a, n = self.val(args[0]), self.val(args[1]) & 0xff
                if op == 'lsls':
                    if n == 0: r = a
                    elif n < 32: self.C = (a >> (32-n)) & 1; r = (a << n) & M
                    elif n == 32: self.C = a & 1; r = 0
                    else: self.C = 0; r = 0
                elif op == 'lsrs':
                    if args[-1].startswith('#') and n == 0: n = 32
                    if n == 0: r = a
                    elif n < 32: self.C = (a >> (n-1)) & 1; r = a >> n
                    elif n == 32: self.C = a >> 31; r = 0
                    else: self.C = 0; r = 0
                else:
                    if args[-1].startswith('#') and n == 0: n = 32
                    sa = a - (1 << 32) if a >> 31 else a
                    if n == 0: r = a
                    elif n < 32: self.C = (a >> (n-1)) & 1; r = (sa >> n) & M
                    else: self.C = a >> 31; r = M if a >> 31 else 0
                self.r[self.reg(args[0])] = self.nz(r)
            elif op == 'muls':
                self.r[self.reg(args[0])] = self.nz(self.val(args[1]) * self.val(args[2] if len(args) > 2 else args[0]))
            elif op in ('ands', 'orrs', 'eors', 'bics'):
                a, b = self.val(args[0]), self.val(args[-1])
                r = {'ands': a & b, 'orrs': a | b, 'eors': a ^ b, 'bics': a & ~b & M}[op]
                self.r[self.reg(args[0])] = self.nz(r)
            elif op == 'mvns': self.r[self.reg(args[0])] = self.nz(~self.val(args[1]) & M)
            elif op == 'uxth': self.r[self.reg(args[0])] = self.val(args[1]) & 0xffff
            elif op == 'uxtb': self.r[self.reg(args[0])] = self.val(args[1]) & 0xff
            elif op == 'sxth': v = self.val(args[1]) & 0xffff; self.r[self.reg(args[0])] = (v - 0x10000 if v >> 15 else v) & M
            elif op in ('ldr', 'ldrh', 'ldrb', 'ldrsh', 'ldrsb'):
                n = {'ldr': 4, 'ldrh': 2, 'ldrb': 1, 'ldrsh': 2, 'ldrsb': 1}[op]
                if args[1].startswith('['): a = self.mem_operand(args[1])
                else: a = self.p.addr[args[1]]
                v = self.ld(a, n)
                if op == 'ldrsh' and v >> 15: v = (v - 0x10000) & M
                if op == 'ldrsb' and v >> 7: v = (v - 0x100) & M
                self.r[self.reg(args[0])] = v
            elif op in ('str', 'strh', 'strb'):
                n = {'str': 4, 'strh': 2, 'strb': 1}[op]
                self.stm(self.mem_operand(args[1]), self.val(args[0]), n)
            elif op in ('push', 'pop', 'ldm', 'stm'):
                if op in ('push', 'pop'): base = 13; lst = rest
                else: base = self.reg(args[0].rstrip('!')); lst = rest[rest.index('{'):]
                regs = [self.reg(x) for x in lst.strip().strip('{}').split(',')]
                if op == 'push':
                    sp = self.r[13] - 4*len(regs)
                    for i, rr in enumerate(regs): self.stm(sp + 4*i, self.r[rr], 4)
                    self.r[13] = sp
                elif op == 'pop':
                    sp = self.r[13]; topc = False
                    for i, rr in enumerate(regs):
                        v = self.ld(sp + 4*i, 4)
                        if rr == 15: topc = True
                        else: self.r[rr] = v
                    self.r[13] = sp + 4*len(regs)
                    if topc: return
                elif op == 'stm':
                    a = self.r[base]
                    for i, rr in enumerate(regs): self.stm(a + 4*i, self.r[rr], 4)
                    self.r[base] = a + 4*len(regs)
                else:
                    a = self.r[base]
                    for i, rr in enumerate(regs): self.r[rr] = self.ld(a + 4*i, 4)
                    if base not in regs: self.r[base] = a + 4*len(regs)
            elif op == 'b':
                if args[0] in labels: pc = labels[args[0]]
                else: self.call(args[0]); return
            elif op.startswith('b') and op[1:] in ('eq','ne','hs','cs','lo','cc','mi','pl','vs','vc','hi','ls','ge','lt','gt','le'):
                if self.cond(op[1:]): pc = labels[args[0]]
            elif op == 'bl': self.call(args[0])
            elif op == 'bx': return
            else: raise NotImplementedError(t)
    def call(self, target):
        self.calls[target] = self.calls.get(target, 0) + 1
        if target.startswith('_ZN'):
            self.run(target)
        elif target.startswith('__aeabi_memcpy'):
            d, s, n = self.r[0], self.r[1], self.r[2]
            self.p.mem[d:d+n] = self.p.mem[s:s+n]
            self.count += 10 + 4*n  # rough cost of a byte copy routine
        else:
            raise NotImplementedError(target)


def main():
    p = Prog(sys.argv[1])
    names = [n for n in p.funcs if '4log28log2_q24' in n]
    log2 = names[0] if names else None
    print('log2_q24:' if log2 else 'log2_q24: inlined')
    for x in [] if log2 is None else [1, 7, 1000, 65535, 131071, 10**9]:
        c = CPU(p); c.r[0] = x; c.r[14] = 0; c.run(log2)
        v = c.r[0] - (1 << 32) if c.r[0] >> 31 else c.r[0]
        print(f'  x = {x:>10}: {c.count:>3} instructions, log2 = {v / 2**24:.6f}')
    for name, frag in (('LinearChain::measure', 'LinearChain7measure'),
                       ('SquareLawChain::measure', 'SquareLawChain7measure')):
        fn = p.find(frag)
        print(f'{name} (floor 1, full scale 65535):')
        worst = 0
        for f, r in [(10000, 1000), (30000, 10000), (20000, 18000), (65000, 1), (1000, 999),
                     (4095, 100), (300, 7), (65534, 65533), (100, 100), (0, 0)]:
            c = CPU(p); selfa = 0x80000; out = 0x81000
            c.stm(selfa, 3885, 4); c.stm(selfa + 4, 65535, 2); c.stm(selfa + 6, 1, 2)
            c.r[0], c.r[1], c.r[2], c.r[3] = out, selfa, f, r
            c.r[14] = 0
            c.run(fn)
            g, s, rl, ml = (c.ld(out + 4 * i, 4) for i in range(4))
            worst = max(worst, c.count)
            if c.ld(out + 16, 1) >= 2:  # the `capped` bool's niche marks the Err variant
                print(f'  f = {f:>5}, r = {r:>5}: {c.count:>3} instructions; refused (fault)')
                continue
            print(f'  f = {f:>5}, r = {r:>5}: {c.count:>3} instructions;'
                  f' |Γ| {g / 2**31:.5f}, VSWR {s / 65536:.4f}, RL {rl / 65536:.4f} dB,'
                  f' ML {ml / 65536:.4f} dB')
        print(f'  most: {worst}')


if __name__ == '__main__':
    main()
