import sys
ref={}
# Usage: compare.py BEFORE AFTER 0|1 [REFERENCE...] (0 = Cv, 1 = S; references: output of `full`, the 44^3 rows are used)
for f in (sys.argv[4:] or ['ref-full.txt']):
    for line in open(f):
        if not line.startswith('FULL'): continue
        p=line.split(); n=p[1]; M=int(p[2][2:])
        if M!=44: continue
        for x in p[3:]:
            t,v=x.split(':'); c,s=v.split('/'); ref[(n,float(t))]=(float(c),float(s))
def load(f):
    e={}
    for line in open(f):
        if not line.startswith('ENG') or 'unstable' in line: continue
        p=[x for x in line.split() if not x.startswith('fl=')]; n=p[1]; M=int(p[2][2:])
        for x in p[3:]:
            t,v=x.split(':'); c,s=v.split('/'); e[(n,M,float(t))]=(float(c),float(s))
    return e
B=load(sys.argv[1]); A=load(sys.argv[2]); q=int(sys.argv[3])
names=[]; [names.append(k[0]) for k in A if k[0] not in names]
Ts=sorted({k[2] for k in A}); Ms=sorted({k[1] for k in A})
worse=[]; 
print("case  T  | max|err| before (mesh) | after (mesh)   [quantity: %s]"%('Cv' if q==0 else 'S'))
for n in names:
    for T in Ts:
        if (n,T) not in ref: continue
        r=ref[(n,T)][q]
        eb=[(abs(B[(n,M,T)][q]/r-1),M) for M in Ms if (n,M,T) in B]
        ea=[(abs(A[(n,M,T)][q]/r-1),M) for M in Ms if (n,M,T) in A]
        mb=max(eb); ma=max(ea)
        for (b,M),(a,_) in zip(eb,ea):
            if a>max(2*b,b+2e-4): worse.append((n,T,M,b,a))
        print(f"{n:8s} {T:5} | {mb[0]:.1e} ({mb[1]:2d}) | {ma[0]:.1e} ({ma[1]:2d})")
print("WORSE (after > max(2x before, before+2e-4)):")
for w in worse: print("  %s T=%s M=%d before %.1e after %.1e"%w)
