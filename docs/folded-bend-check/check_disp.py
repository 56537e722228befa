# compares the engine's dispersion table with bend_lattice.py's omegas (relative difference, worst)
import sys, subprocess, numpy as np
kind, d = sys.argv[1], sys.argv[2]
sys.argv=[sys.argv[0], kind, 'none']
src=open(__file__.replace('check_disp.py','bend_lattice.py')).read().split("temps=[")[0]
exec(src)
out=subprocess.run(['/tmp/lead19/dq/out/dq','--sql',f"SELECT path_index, qx_per_nm, qy_per_nm, qz_per_nm, branch, freq_thz FROM read_parquet('{d}/dispersion/*.parquet') WHERE sample_mesh=(SELECT min(sample_mesh) FROM read_parquet('{d}/dispersion/*.parquet')) ORDER BY 1,5"],capture_output=True,text=True).stdout
rows=[[float(x) for x in l.split('|')] for l in out.strip().splitlines()]
worst=0
for r in rows:
    q=np.array([r[1],r[2],r[3]])*1e9
    w=omegas(q[None,:])[0][int(r[4])]/2/np.pi/1e12
    if w>1e-6: worst=max(worst,abs(w-r[5])/w)
print(kind,'points',len(rows),'worst relative difference',worst)
