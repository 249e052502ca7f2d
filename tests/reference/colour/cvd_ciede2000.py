"""Independent reference for tests/reference/colour/cvd-ciede2000.test.ts (run: python3 this file; numpy only).

- CIEDE2000 as written by Sharma, Wu & Dalal (2005), "The CIEDE2000 color-difference formula: implementation
  notes, supplementary test data, and mathematical observations", Color Res. Appl. 30(1):21-30; checked
  against all 34 pairs of their Table 1 (printed to 4 decimals).
- Colour-vision deficiency: Machado, Oliveira & Fernandes (2009), IEEE TVCG 15(6):1291-1298, severity 1.0
  matrices applied to linear-light sRGB, clipped to [0, 1].
- sRGB (IEC 61966-2-1): transfer function, and the RGB -> XYZ matrix derived here from the primaries'
  and D65's xy chromaticities; CIELAB with the D65 white.
"""
import numpy as np, itertools, json, sys

def de2000(lab1, lab2, kL=1, kC=1, kH=1):
    L1,a1,b1 = lab1; L2,a2,b2 = lab2
    C1 = np.hypot(a1,b1); C2 = np.hypot(a2,b2)
    Cb = (C1+C2)/2
    G = 0.5*(1-np.sqrt(Cb**7/(Cb**7+25.0**7)))
    a1p = (1+G)*a1; a2p=(1+G)*a2
    C1p = np.hypot(a1p,b1); C2p=np.hypot(a2p,b2)
    def hp(a,b):
        if a==0 and b==0: return 0.0
        h = np.degrees(np.arctan2(b,a))
        return h+360 if h<0 else h
    h1p=hp(a1p,b1); h2p=hp(a2p,b2)
    dLp = L2-L1; dCp = C2p-C1p
    if C1p*C2p==0: dhp=0.0
    else:
        dhp = h2p-h1p
        if dhp>180: dhp-=360
        elif dhp<-180: dhp+=360
    dHp = 2*np.sqrt(C1p*C2p)*np.sin(np.radians(dhp/2))
    Lbp=(L1+L2)/2; Cbp=(C1p+C2p)/2
    if C1p*C2p==0: hbp=h1p+h2p
    else:
        if abs(h1p-h2p)<=180: hbp=(h1p+h2p)/2
        elif h1p+h2p<360: hbp=(h1p+h2p+360)/2
        else: hbp=(h1p+h2p-360)/2
    T = 1-0.17*np.cos(np.radians(hbp-30))+0.24*np.cos(np.radians(2*hbp))+0.32*np.cos(np.radians(3*hbp+6))-0.20*np.cos(np.radians(4*hbp-63))
    dtheta = 30*np.exp(-((hbp-275)/25)**2)
    RC = 2*np.sqrt(Cbp**7/(Cbp**7+25.0**7))
    SL = 1+0.015*(Lbp-50)**2/np.sqrt(20+(Lbp-50)**2)
    SC = 1+0.045*Cbp; SH=1+0.015*Cbp*T
    RT = -np.sin(np.radians(2*dtheta))*RC
    return float(np.sqrt((dLp/(kL*SL))**2+(dCp/(kC*SC))**2+(dHp/(kH*SH))**2+RT*(dCp/(kC*SC))*(dHp/(kH*SH))))

SHARMA = [
 ((50.0000,2.6772,-79.7751),(50.0000,0.0000,-82.7485),2.0425),
 ((50.0000,3.1571,-77.2803),(50.0000,0.0000,-82.7485),2.8615),
 ((50.0000,2.8361,-74.0200),(50.0000,0.0000,-82.7485),3.4412),
 ((50.0000,-1.3802,-84.2814),(50.0000,0.0000,-82.7485),1.0000),
 ((50.0000,-1.1848,-84.8006),(50.0000,0.0000,-82.7485),1.0000),
 ((50.0000,-0.9009,-85.5211),(50.0000,0.0000,-82.7485),1.0000),
 ((50.0000,0.0000,0.0000),(50.0000,-1.0000,2.0000),2.3669),
 ((50.0000,-1.0000,2.0000),(50.0000,0.0000,0.0000),2.3669),
 ((50.0000,2.4900,-0.0010),(50.0000,-2.4900,0.0009),7.1792),
 ((50.0000,2.4900,-0.0010),(50.0000,-2.4900,0.0010),7.1792),
 ((50.0000,2.4900,-0.0010),(50.0000,-2.4900,0.0011),7.2195),
 ((50.0000,2.4900,-0.0010),(50.0000,-2.4900,0.0012),7.2195),
 ((50.0000,-0.0010,2.4900),(50.0000,0.0009,-2.4900),4.8045),
 ((50.0000,-0.0010,2.4900),(50.0000,0.0010,-2.4900),4.8045),
 ((50.0000,-0.0010,2.4900),(50.0000,0.0011,-2.4900),4.7461),
 ((50.0000,2.5000,0.0000),(50.0000,0.0000,-2.5000),4.3065),
 ((50.0000,2.5000,0.0000),(73.0000,25.0000,-18.0000),27.1492),
 ((50.0000,2.5000,0.0000),(61.0000,-5.0000,29.0000),22.8977),
 ((50.0000,2.5000,0.0000),(56.0000,-27.0000,-3.0000),31.9030),
 ((50.0000,2.5000,0.0000),(58.0000,24.0000,15.0000),19.4535),
 ((50.0000,2.5000,0.0000),(50.0000,3.1736,0.5854),1.0000),
 ((50.0000,2.5000,0.0000),(50.0000,3.2972,0.0000),1.0000),
 ((50.0000,2.5000,0.0000),(50.0000,1.8634,0.5757),1.0000),
 ((50.0000,2.5000,0.0000),(50.0000,3.2592,0.3350),1.0000),
 ((60.2574,-34.0099,36.2677),(60.4626,-34.1751,39.4387),1.2644),
 ((63.0109,-31.0961,-5.8663),(62.8187,-29.7946,-4.0864),1.2630),
 ((61.2901,3.7196,-5.3901),(61.4292,2.2480,-4.9620),1.8731),
 ((35.0831,-44.1164,3.7933),(35.0232,-40.0716,1.5901),1.8645),
 ((22.7233,20.0904,-46.6940),(23.0331,14.9730,-42.5619),2.0373),
 ((36.4612,47.8580,18.3852),(36.2715,50.5065,21.2231),1.4146),
 ((90.8027,-2.0831,1.4410),(91.1528,-1.6435,0.0447),1.4441),
 ((90.9257,-0.5406,-0.9208),(88.6381,-0.8985,-0.7239),1.5381),
 ((6.7747,-0.2908,-2.4247),(5.8714,-0.0985,-2.2286),0.6377),
 ((2.0776,0.0795,-1.1350),(0.9033,-0.0636,-0.5514),0.9082),
]
bad = [(i+1, round(de2000(a,b),4), e) for i,(a,b,e) in enumerate(SHARMA) if abs(de2000(a,b)-e) > 5e-5]
print("Sharma pairs checked:", len(SHARMA), "mismatches:", bad)

# sRGB (IEC 61966-2-1) primaries and D65 white, matrix derived from chromaticities
xy = {'r':(0.64,0.33),'g':(0.30,0.60),'b':(0.15,0.06)}; W=(0.3127,0.3290)
def XYZ(x,y): return np.array([x/y,1.0,(1-x-y)/y])
P = np.column_stack([XYZ(*xy[c]) for c in 'rgb'])
Wv = XYZ(*W)
S = np.linalg.solve(P, Wv)
M = P*S
def lin(c): c=np.asarray(c,float); return np.where(c<=0.04045, c/12.92, ((c+0.055)/1.055)**2.4)
def hex2rgb(h): h=h.lstrip('#'); return np.array([int(h[i:i+2],16)/255 for i in (0,2,4)])
def f(t):
    d=6/29
    return np.where(t>d**3, np.cbrt(t), t/(3*d*d)+4/29)
def lab_of_lin(rgbl):
    X = M@rgbl
    fx,fy,fz = f(X/Wv)
    return (116*fy-16, 500*(fx-fy), 200*(fy-fz))
MACHADO = {
 'protanopia': np.array([[0.152286,1.052583,-0.204868],[0.114503,0.786281,0.099216],[-0.003882,-0.048116,1.051998]]),
 'deuteranopia': np.array([[0.367322,0.860646,-0.227968],[0.280085,0.672501,0.047413],[-0.011820,0.042940,0.968881]]),
 'tritanopia': np.array([[1.255528,-0.076749,-0.178779],[-0.078411,0.930809,0.147602],[0.004733,0.691367,0.303900]]),
}
def sim(hexc, kind):
    l = lin(hex2rgb(hexc))
    if kind=='normal': return lab_of_lin(l)
    return lab_of_lin(np.clip(MACHADO[kind]@l,0,1))
def dE(h1,h2,kind): return de2000(sim(h1,kind), sim(h2,kind))
if __name__=='__main__':
    OI = {'black':'#000000','orange':'#E69F00','skyBlue':'#56B4E9','bluishGreen':'#009E73','yellow':'#F0E442','blue':'#0072B2','vermillion':'#D55E00','reddishPurple':'#CC79A7'}
    kinds=['normal','deuteranopia','protanopia','tritanopia']
    rows=[]
    for (n1,h1),(n2,h2) in itertools.combinations(OI.items(),2):
        rows.append((n1,n2,[round(dE(h1,h2,k),4) for k in kinds]))
    rows.sort(key=lambda r: min(r[2][1:]))
    for r in rows: print(r)
    for pair in [('#D62728','#2CA02C'),('#FF0000','#00FF00'),('#0072B2','#D55E00')]:
        print(pair, [round(dE(*pair,k),4) for k in kinds])
