# Independent NumPy reference for Round 29 (degenerate modes): kappa_aa of a finite periodic simple cubic crystal
# (N^3 cells, Born-von Karman), constant relaxation time, with degenerate sets counted in the basis-independent trace form
#   kappa_aa = (1/V) sum_q sum_sets C(omega) tau Tr_S(V_a V_a),   V_a,ss' = <e_s| dD/dq_a |e_s'> / (omega_s + omega_s'),
# the velocity matrix of the harmonic heat current (Hardy, Phys. Rev. 132, 168 (1963); inside a degenerate set its
# off-diagonal elements do not oscillate and count like diagonal ones, as in the Wigner/Green-Kubo form of Simoncelli,
# Marzari and Mauri, Nat. Phys. 15, 809 (2019), from memory). Also prints the rule main used before Round 29 (diagonal
# elements after diagonalising dD/dq along u0 = (2,1,3)/sqrt(14), averaged over u0's orbit under x -> y -> z), for comparison.
# Invented model: a = 0.3 nm, 20 amu, 3d motion, pair springs by shell, tensor K = L e e^T + T (1 - e e^T) (derived by
# hand), D(q) = (1/m) sum_R K_R (1 - cos q.R), dD/dq_a = (1/m) sum_R K_R R_a sin q.R (common practice, no source).
# With BOUNDARY_NM=L set, boundary scattering is added by Matthiessen's rule, 1/tau = 1/TAU + |v|/L (Casimir, Physica 5,
# 495 (1938)), and a degenerate set's trace is shared out as sum_s tau_s (V_a^2)_ss = sum_ss' (tau_s + tau_s')/2 |V_a,ss'|^2,
# each branch's |v| read after diagonalising dD/dq along each direction of u0's orbit, averaged over the orbit (the
# engine's documented symmetric rule, docs/conductivity.md "Degenerate branches"; the rotation is unique where the set splits).
# Usage: [BOUNDARY_NM=L] /usr/bin/python3 reference.py N TAU_PS L1 T1 L2 T2 T_K...
import os, sys, itertools, numpy as np
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
boundary=float(os.environ['BOUNDARY_NM'])*1e-9 if os.environ.get('BOUNDARY_NM') else None
def tau_of(speed): return tau if boundary is None else 1/(1/tau+speed/boundary)
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
            if e-s>1: nsets+=1
            for u in (orbit if e-s>1 else orbit[:1]):
                _,U=np.linalg.eigh(sum(u[c_]*Va[c_] for c_ in range(3)))
                turned=[U.conj().T@V@U for V in Va]
                speeds=np.sqrt(sum(np.real(np.diag(V))**2 for V in turned))
                taus=np.array([tau_of(sp) for sp in speeds]); share=3 if e-s>1 else 1
                trace+=c*np.array([np.sum(taus[:,None]*np.abs(V)**2) for V in turned])/share
                diag+=c*np.array([np.sum(taus*np.real(np.diag(V))**2) for V in turned])/share
    vol=(N*a)**3
    print(f"T={T} N={N} degenerate_sets={nsets} trace_xx,yy,zz={list(trace/vol)!r} diag_u0_xx,yy,zz={list(diag/vol)!r}")
