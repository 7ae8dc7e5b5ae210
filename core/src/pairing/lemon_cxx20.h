// LEMON 1.3.1 keeps node and arc maps of class and enum types in its ArrayMap, which calls
// std::allocator<T>::construct and ::destroy, removed in C++20. The maps the matching needs
// (matching arcs, the fractional start's status enum) are kept in LEMON's own VectorMap
// instead, which is built on std::vector. Include after lemon/smart_graph.h and before
// lemon/matching.h is used.
#pragma once

#include <lemon/bits/default_map.h>
#include <lemon/bits/vector_map.h>
#include <lemon/smart_graph.h>

#include <type_traits>

namespace lemon {

template <typename G, typename I, typename V>
requires(std::is_enum_v<V> ||
         std::is_same_v<V, SmartGraphBase::Arc>) struct DefaultMapSelector<G, I, V> {
  typedef VectorMap<G, I, V> Map;
};

}  // namespace lemon
