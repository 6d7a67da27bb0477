// A second 3MF reader for the tests: the 3MF Consortium's reference library (lib3mf 1.8, Debian's
// lib3mf-dev). Prints one JSON line for a file: triangles, volume, area and bounding box of the
// build in millimetres, every build item's and component's transform applied (3MF Core §4.1, §5.1.1).
// Built by tests/unit/mesh/lib3mf.test.ts: g++ -std=c++17 lib3mf-read.cpp -I/usr/include/lib3mf -l3MF
#include <Model/COM/NMR_DLLInterfaces.h>
#include <cmath>
#include <cstdio>
#include <vector>

using namespace NMR;

struct M { double f[3][4]; };
static M identity() { M m{}; for (int i = 0; i < 3; i++) m.f[i][i] = 1; return m; }
// apply `first`, then `then`
static M compose(const M& first, const M& then) {
  M r{};
  for (int i = 0; i < 3; i++) {
    for (int j = 0; j < 4; j++) {
      double s = (j == 3) ? then.f[i][3] : 0;
      for (int k = 0; k < 3; k++) s += then.f[i][k] * first.f[k][j];
      r.f[i][j] = s;
    }
  }
  return r;
}
static M fromModel(const MODELTRANSFORM& t) { M m; for (int i = 0; i < 3; i++) for (int j = 0; j < 4; j++) m.f[i][j] = t.m_fFields[i][j]; return m; }

static long tris = 0;
static double vol6 = 0, area2 = 0, lo[3] = {INFINITY, INFINITY, INFINITY}, hi[3] = {-INFINITY, -INFINITY, -INFINITY};

static int walk(PLib3MFModelObjectResource* obj, const M& m) {
  BOOL isMesh = 0, isComp = 0;
  if (lib3mf_object_ismeshobject(obj, &isMesh) != 0) return 1;
  if (isMesh) {
    DWORD nv = 0, nt = 0;
    lib3mf_meshobject_getvertexcount(obj, &nv);
    lib3mf_meshobject_gettrianglecount(obj, &nt);
    std::vector<double> p(3 * nv);
    for (DWORD i = 0; i < nv; i++) {
      MODELMESHVERTEX v;
      lib3mf_meshobject_getvertex(obj, i, &v);
      for (int r = 0; r < 3; r++) {
        double s = m.f[r][3];
        for (int k = 0; k < 3; k++) s += m.f[r][k] * v.m_fPosition[k];
        p[3 * i + r] = s;
        if (s < lo[r]) lo[r] = s;
        if (s > hi[r]) hi[r] = s;
      }
    }
    for (DWORD t = 0; t < nt; t++) {
      MODELMESHTRIANGLE tr;
      lib3mf_meshobject_gettriangle(obj, t, &tr);
      const double* a = &p[3 * tr.m_nIndices[0]];
      const double* b = &p[3 * tr.m_nIndices[1]];
      const double* c = &p[3 * tr.m_nIndices[2]];
      double e1[3] = {b[0] - a[0], b[1] - a[1], b[2] - a[2]}, e2[3] = {c[0] - a[0], c[1] - a[1], c[2] - a[2]};
      double n[3] = {e1[1] * e2[2] - e1[2] * e2[1], e1[2] * e2[0] - e1[0] * e2[2], e1[0] * e2[1] - e1[1] * e2[0]};
      area2 += std::sqrt(n[0] * n[0] + n[1] * n[1] + n[2] * n[2]);
      vol6 += a[0] * n[0] + a[1] * n[1] + a[2] * n[2];
      tris++;
    }
    return 0;
  }
  if (lib3mf_object_iscomponentsobject(obj, &isComp) != 0 || !isComp) return 0;
  DWORD nc = 0;
  lib3mf_componentsobject_getcomponentcount(obj, &nc);
  for (DWORD i = 0; i < nc; i++) {
    PLib3MFModelComponent* comp = nullptr;
    PLib3MFModelObjectResource* child = nullptr;
    MODELTRANSFORM t;
    if (lib3mf_componentsobject_getcomponent(obj, i, &comp) != 0) return 1;
    if (lib3mf_component_getobjectresource(comp, &child) != 0) return 1;
    lib3mf_component_gettransform(comp, &t);
    if (walk(child, compose(fromModel(t), m))) return 1;
  }
  return 0;
}

int main(int argc, char** argv) {
  if (argc < 2) return 2;
  PLib3MFModel* model = nullptr;
  PLib3MFModelReader* reader = nullptr;
  if (lib3mf_createmodel(&model) != 0) return 3;
  if (lib3mf_model_queryreader(model, "3mf", &reader) != 0) return 3;
  if (lib3mf_reader_readfromfileutf8(reader, argv[1]) != 0) { std::printf("{\"error\":\"lib3mf could not read the file\"}\n"); return 4; }
  DWORD unit = 0;
  lib3mf_model_getunit(model, &unit);
  const double mm[] = {0.001, 1, 10, 25.4, 304.8, 1000}; // eModelUnit: micron, millimeter, centimeter, inch, foot, meter
  const double s = unit < 6 ? mm[unit] : 1;
  M scale{}; for (int i = 0; i < 3; i++) scale.f[i][i] = s;
  PLib3MFModelBuildItemIterator* it = nullptr;
  lib3mf_model_getbuilditems(model, &it);
  BOOL has = 0;
  while (lib3mf_builditemiterator_movenext(it, &has) == 0 && has) {
    PLib3MFModelBuildItem* item = nullptr;
    PLib3MFModelObjectResource* obj = nullptr;
    lib3mf_builditemiterator_getcurrent(it, &item);
    lib3mf_builditem_getobjectresource(item, &obj);
    BOOL hasT = 0;
    lib3mf_builditem_hasobjecttransform(item, &hasT);
    M m = identity();
    if (hasT) { MODELTRANSFORM t; lib3mf_builditem_getobjecttransform(item, &t); m = fromModel(t); }
    if (walk(obj, compose(m, scale))) { std::printf("{\"error\":\"lib3mf could not walk the build\"}\n"); return 5; }
  }
  std::printf("{\"triangles\":%ld,\"volume\":%.17g,\"area\":%.17g,\"min\":[%.9g,%.9g,%.9g],\"max\":[%.9g,%.9g,%.9g]}\n", tris, vol6 / 6, area2 / 2, lo[0], lo[1], lo[2], hi[0], hi[1], hi[2]);
  return 0;
}
