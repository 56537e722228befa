# Independent NumPy reference for Round 29 (degenerate modes): kappa_aa of a finite periodic simple cubic crystal
# (N^3 cells, Born-von Karman), constant relaxation time, with degenerate sets counted in the basis-independent trace form
#   kappa_aa = (1/V) sum_q sum_sets C(omega) tau Tr_S(V_a V_a),   V_a,ss' = <e_s| dD/dq_a |e_s'> / (omega_s + omega_s'),
# the velocity matrix of the harmonic heat current (Hardy, Phys. Rev. 132, 168 (1963); inside a degenerate set its
# off-diagonal elements do not oscillate and count like diagonal ones, as in the Wigner/Green-Kubo form of Simoncelli,
# Marzari and Mauri, Nat. Phys. 15, 809 (2019), from memory). Also prints the rule main used before Round 29 (diagonal
# elements after diagonalising dD/dq along u0 = (2,1,3)/sqrt(14), averaged over u0's orbit under x -> y -> z), for comparison.
# Invented model: a = 0.3 nm, 20 amu, 3d motion, pair springs by shell, tensor K = L e e^T + T (1 - e e^T) (derived by
# hand), D(q) = (1/m) sum_R K_R (1 - cos q.R), dD/dq_a = (1/m) sum_R K_R R_a sin q.R (common practice, no source).
# Usage: /usr/bin/python3 reference.py N TAU_PS L1 T1 L2 T2 T_K...
import sys, itertools, numpy as np
hbar=6.62607015e-34/(2*np.pi); kB=1.380649e-23; amu=1.66053906660e-27
a=0.3e-9; m=20*amu
N=int(sys.argv[1]); tau=float(sys.argv[2])*1e-12
L1,T1,L2,T2=map(float,sys.argv[3:7]); temps=list(map(float,sys.argv[7:]))
bonds=[]
for v in itertools.product((-1,0,1),repeat=3):
    s=sum(abs(c) for c in v)
    if s in (1,2):
        e=np.array(v,float); r=np.linalg.norm(e); e/=r
        L,T=(L1,T1) if s==1 else (L2,T2)
        bonds.append((np.array(v,float)*a, L*np.outer(e,e)+T*(np.eye(3)-np.outer(e,e))))
def D(q):
    return sum(K*(1-np.cos(q@R)) for R,K in bonds)/m
def dD(q):
    return [sum(K*R[c]*np.sin(q@R) for R,K in bonds)/m for c in range(3)]
u0=np.array([2,1,3])/np.sqrt(14); orbit=[u0,u0[[2,0,1]],u0[[1,2,0]]]
def cmode(w,T):
    x=hbar*w/(kB*T); return kB*x*x*np.exp(x)/np.expm1(x)**2
for T in temps:
    trace=np.zeros(3); diag=np.zeros(3); nsets=0
    for n in itertools.product(range(N),repeat=3):
        if n==(0,0,0): continue  # q = 0: rigid translations carry no heat
        q=2*np.pi*np.array(n)/(N*a)
        lam,E=np.linalg.eigh(D(q)); w=np.sqrt(lam); g=dD(q)
        tol=1e-6*np.sqrt(lam.max()); sets=[]; s=0
        while s<3:
            e=s+1
            while e<3 and abs(w[e]-w[s])<=tol: e+=1
            sets.append((s,e)); s=e
        for s,e in sets:
            P=E[:,s:e]; wk=w[s:e]; c=cmode(wk[0],T)
            Va=[P.conj().T@g[c_]@P/(wk[:,None]+wk[None,:]) for c_ in range(3)]
            trace+=c*tau*np.array([np.sum(np.abs(V)**2) for V in Va])
            if e-s>1: nsets+=1
            for u in (orbit if e-s>1 else orbit[:1]):
                _,U=np.linalg.eigh(sum(u[c_]*Va[c_] for c_ in range(3)))
                diag+=c*tau*np.array([np.sum(np.abs(np.diag(U.conj().T@V@U))**2) for V in Va])/(3 if e-s>1 else 1)
    vol=(N*a)**3
    print(f"T={T} N={N} degenerate_sets={nsets} trace_xx,yy,zz={list(trace/vol)!r} diag_u0_xx,yy,zz={list(diag/vol)!r}")
