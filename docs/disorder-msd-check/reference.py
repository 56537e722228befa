# References for DisorderTests: msd_interior_nm2 of a periodic disordered supercell (run: python3 reference.py).
# A periodic scalar ring of 12 atoms of 20 amu, nearest-neighbour springs 10 N/m, one atom replaced by 10 amu
# (concentration 1/12): every configuration is the same ring turned, so the mean over its atoms is one number.
# Exact mode sum <u_i^2> = sum_k hbar / (2 omega_k) coth(hbar omega_k / 2 kB T) e_ik^2 / m_i over the eigenvectors
# of the mass-weighted spring matrix, the rigid translation (omega = 0) left out (common practice, no source);
# CODATA 2018 constants. Also the virtual crystal (every mass the configurations' mean) of the same ring.
import numpy as np
hbar=6.62607015e-34/(2*np.pi); kB=1.380649e-23; amu=1.66053906660e-27
N=12; k=10.0; T=300.0

def ring_msd(masses):
    m=np.array(masses)*amu; K=np.zeros((N,N))
    for i in range(N):
        j=(i+1)%N
        K[i,i]+=k; K[j,j]+=k; K[i,j]-=k; K[j,i]-=k
    D=K/np.sqrt(np.outer(m,m)); w2,e=np.linalg.eigh(D)
    msd=np.zeros(N)
    for kk in range(N):
        if w2[kk] < 1e-8*w2.max(): continue
        w=np.sqrt(w2[kk]); f=hbar/(2*w)/np.tanh(hbar*w/(2*kB*T))
        msd+=f*e[:,kk]**2/m
    return msd*1e18, (w2 < 1e-8*w2.max()).sum()

disordered, zeros = ring_msd([10.0]+[20.0]*(N-1))
print("zero modes", zeros)
print("substitute %.15e host mean %.15e" % (disordered[0], disordered[1:].mean()))
print("disordered ring, mean over all 12 atoms %.15e nm^2" % disordered.mean())
vca, _ = ring_msd([(10.0+20.0*(N-1))/N]*N)
print("virtual crystal ring (every mass %.12f amu), mean %.15e nm^2" % ((10.0+20.0*(N-1))/N, vca.mean()))
